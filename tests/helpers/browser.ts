/**
 * A real headless browser for tests: playwright-core driving Debian's Chromium (/usr/bin/chromium).
 * Each call gets a fresh profile folder, so no state leaks between tests.
 */
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
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

export async function openBrowser(
	viewport = { width: 1280, height: 860 },
	options: { javaScript?: boolean } = {}
): Promise<BrowserSession> {
	const javaScript = options.javaScript ?? true;
	const profile = mkdtempSync(path.join(tmpdir(), 'wrenchroll-chromium-'));
	const context = await chromium.launchPersistentContext(profile, {
		executablePath: CHROMIUM,
		headless: true,
		acceptDownloads: true,
		viewport,
		javaScriptEnabled: javaScript,
		baseURL: inject('baseUrl'),
		args: [
			'--no-sandbox',
			'--disable-gpu',
			'--disable-quic',
			'--no-first-run',
			'--disable-background-networking',
			'--disable-component-update',
			'--disable-sync'
		]
	});
	context.setDefaultTimeout(15_000);
	const page = context.pages()[0] ?? (await context.newPage());
	// Without JavaScript nothing hydrates: pages are ready when they have loaded.
	if (javaScript) waitForHydrationOnLoad(page);
	return {
		context,
		page,
		async close() {
			await context.close();
			rmSync(profile, { recursive: true, force: true });
		}
	};
}

/**
 * A full page load paints server-rendered HTML before the client takes it over; typing into a field
 * in that gap can be undone when the page hydrates. So `goto` and `reload` on HTML pages also wait
 * for the mark the root layout sets once hydrated (`<html data-hydrated>`), as a person would wait
 * for the page to settle (except with `waitUntil: 'commit'`).
 */
function waitForHydrationOnLoad(page: Page): void {
	const settle = async (response: Awaited<ReturnType<Page['goto']>>) => {
		if (response && (response.headers()['content-type'] ?? '').startsWith('text/html')) {
			await page.waitForSelector('html[data-hydrated]', { state: 'attached' });
		}
		return response;
	};
	const goto = page.goto.bind(page);
	const reload = page.reload.bind(page);
	// A caller that asks for `commit` wants the page before it is ready, so it gets it as it is.
	page.goto = async (url, options) =>
		options?.waitUntil === 'commit' ? goto(url, options) : settle(await goto(url, options));
	page.reload = async (options) =>
		options?.waitUntil === 'commit' ? reload(options) : settle(await reload(options));
}

/**
 * Switches channel with the top bar's picker, as a person would, and waits until the page the switch
 * lands on has loaded and hydrated. Waiting only for the form's answer is not enough: the browser
 * then still follows the redirect, and a `goto` made meanwhile is interrupted by it.
 */
export async function switchChannel(page: Page, name: string): Promise<void> {
	// A sign-in starts in the channel the person chose last, which may already be this one.
	const current = await page
		.getByLabel('Channel')
		.evaluate((select: HTMLSelectElement) => select.selectedOptions[0]?.textContent?.trim() ?? '');
	if (current === name) return;
	const landed = page.waitForEvent(
		'framenavigated',
		(frame) => frame === page.mainFrame() && !new URL(frame.url()).pathname.startsWith('/channel')
	);
	await page.getByLabel('Channel').selectOption({ label: name });
	await landed;
	await page.waitForLoadState('load');
	await page.waitForSelector('html[data-hydrated]', { state: 'attached' });
}

/** Signs in through the real sign-in form and waits for the bench (home page). */
export async function signInAs(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
	await page.goto('/signin');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	// Either the bench opens or the form says why not; say which, so a failure reads plainly.
	const refused = page.getByRole('alert');
	const left = page.waitForURL((url) => !url.pathname.startsWith('/signin')).then(() => true);
	const said = refused.waitFor().then(() => false);
	// The losing wait times out later; swallow that so it is not an unhandled rejection.
	left.catch(() => {});
	said.catch(() => {});
	const signedIn = await Promise.race([left, said]);
	if (!signedIn) {
		throw new Error(`sign-in as ${email} was refused: ${await refused.textContent()}`);
	}
}

const require = createRequire(import.meta.url);
const axeSource = readFileSync(require.resolve('axe-core/axe.min.js'), 'utf8');

/** The WCAG rule sets axe-core checks (its tags for WCAG 2.0, 2.1 and 2.2, levels A and AA). */
const WCAG_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa'];

export interface Finding {
	rule: string;
	impact: string;
	targets: string[];
	summary: string;
}

/**
 * axe-core's serious and critical findings on the page, for WCAG 2.0–2.2 levels A and AA (the npm
 * package `axe-core`; tests/REFERENCES.md, "Accessibility"). Run in the page through the browser's
 * debugger, so the page's CSP allows it.
 */
export async function seriousFindings(page: Page): Promise<Finding[]> {
	await page.evaluate(axeSource);
	const violations = await page.evaluate(async (tags) => {
		const axe = (
			window as unknown as {
				axe: {
					run(
						context: Document,
						options: object
					): Promise<{
						violations: {
							id: string;
							impact: string | null;
							nodes: { target: string[]; failureSummary?: string }[];
						}[];
					}>;
				};
			}
		).axe;
		const result = await axe.run(document, { runOnly: { type: 'tag', values: tags } });
		return result.violations.map((violation) => ({
			rule: violation.id,
			impact: violation.impact ?? '',
			targets: violation.nodes.map((node) => node.target.join(' ')),
			summary: violation.nodes[0]?.failureSummary ?? ''
		}));
	}, WCAG_TAGS);
	return violations.filter((finding) => ['serious', 'critical'].includes(finding.impact));
}
