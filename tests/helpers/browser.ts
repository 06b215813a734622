/**
 * A real headless browser for tests: playwright-core driving Debian's Chromium (/usr/bin/chromium).
 * Each call gets a fresh profile folder, so no state leaks between tests.
 */
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { inject } from 'vitest';
import { DEMO_PASSWORD } from './http';

export const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';

export interface BrowserSession {
	context: BrowserContext;
	page: Page;
	close(): Promise<void>;
}

export async function openBrowser(viewport = { width: 1280, height: 860 }): Promise<BrowserSession> {
	const profile = mkdtempSync(path.join(tmpdir(), 'wrenchroll-chromium-'));
	const context = await chromium.launchPersistentContext(profile, {
		executablePath: CHROMIUM,
		headless: true,
		acceptDownloads: true,
		viewport,
		baseURL: inject('baseUrl'),
		args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync']
	});
	context.setDefaultTimeout(15_000);
	const page = context.pages()[0] ?? (await context.newPage());
	return {
		context,
		page,
		async close() {
			await context.close();
			rmSync(profile, { recursive: true, force: true });
		}
	};
}

/** Signs in through the real sign-in form and waits for the bench (home page). */
export async function signInAs(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
	await page.goto('/signin');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await page.waitForURL((url) => !url.pathname.startsWith('/signin'));
}
