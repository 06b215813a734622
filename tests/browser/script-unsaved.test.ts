/**
 * Leaving the script editor with unsaved changes. Inside the page (a link) the editor asks with its
 * own words; when the whole page unloads (another address, a reload, closing the tab) browsers allow
 * only their own "leave site?" prompt and block confirm() (HTML Living Standard, "beforeunload":
 * showing a dialog during unload is not allowed; Chromium logs the blocked call). SvelteKit's
 * beforeNavigate documents that cancelling a "leave" navigation shows that native prompt.
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, signedIn, sql } from '../helpers/http';

let browser: BrowserSession;
let episodeId: string;
let segmentId: string;

beforeAll(async () => {
	const host = await signedIn(demo.host);
	const producer = await signedIn(demo.producer);
	const created = await producer.api('/api/episodes', {
		method: 'POST',
		json: { title: `Unsaved script ${Date.now()}`, targetRuntimeSeconds: 600, frameRate: '25' }
	});
	episodeId = created.body.episode.id;
	const segment = await host.api(`/api/episodes/${episodeId}/segments`, {
		method: 'POST',
		json: { kind: 'overview', title: 'Why a tapered block', plannedSeconds: 60 }
	});
	segmentId = segment.body.segment.id;
	browser = await openBrowser();
	await signInAs(browser.page, demo.host);
});

afterAll(async () => {
	await browser?.close();
	await sql(`DELETE FROM episode WHERE id = $1`, [episodeId]);
});

test('unloading with unsaved text raises only the browser’s own prompt, never a blocked confirm()', async () => {
	const { page } = browser;
	const dialogs: string[] = [];
	const blocked: string[] = [];
	page.on('dialog', (dialog) => {
		dialogs.push(dialog.type());
		void dialog.dismiss();
	});
	page.on('console', (message) => {
		if (/blocked confirm/i.test(message.text())) blocked.push(message.text());
	});
	await page.goto(`/episodes/${episodeId}/script/${segmentId}`);
	await page.locator('#script-body').fill('A line the host has not saved yet.');
	// Unload the page; dismissing the prompt keeps it.
	await page.evaluate(() => {
		location.href = '/episodes';
	});
	await expect.poll(() => dialogs.length).toBeGreaterThan(0);
	expect(dialogs).toEqual(['beforeunload']);
	expect(blocked).toEqual([]);
	expect(await page.locator('#script-body').inputValue()).toBe(
		'A line the host has not saved yet.'
	);
});
