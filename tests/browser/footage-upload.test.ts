/**
 * In a real browser: the camera operator uploads two clips at once, reloads the page in the middle,
 * adds the same files again, and both uploads continue from the server's offset (tus 1.0.0 HEAD)
 * instead of starting over, then finish with the same SHA-256 as the files on disk.
 */
import { createHash, randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

let browser: BrowserSession;
const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-browser-upload-'));
const files = ['bay3-a-cam-0412.mp4', 'bay3-b-cam-0107.mp4'].map((name) => {
	const data = randomBytes(16 * 1024 * 1024);
	const file = path.join(work, name);
	writeFileSync(file, data);
	return { name, file, sha: createHash('sha256').update(data).digest('hex') };
});

beforeAll(async () => {
	browser = await openBrowser();
});
afterAll(async () => {
	await browser?.close();
	rmSync(work, { recursive: true, force: true });
});

test('two uploads survive a page reload and finish without starting over', async () => {
	const { page, context } = browser;
	const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`);
	await signInAs(page, demo.camera);
	await page.goto(`/episodes/${episode.id}/footage`);

	// Slow the uplink to about 3 MB/s so the reload lands mid-upload (Chrome DevTools Protocol throttling).
	const cdp = await context.newCDPSession(page);
	await cdp.send('Network.enable');
	await cdp.send('Network.emulateNetworkConditions', {
		offline: false,
		latency: 0,
		downloadThroughput: -1,
		uploadThroughput: 3 * 1024 * 1024
	});

	await page.getByTestId('upload-input').setInputFiles(files.map((f) => f.file));
	const rows = page.getByTestId('upload-row');
	await expect.poll(() => rows.count()).toBe(2);
	// Wait until both have sent something past their first chunk.
	await expect
		.poll(
			async () =>
				Promise.all(
					[0, 1].map(async (i) =>
						Number(await rows.nth(i).getByRole('progressbar').getAttribute('aria-valuenow'))
					)
				),
			{ timeout: 30_000 }
		)
		.toSatisfy((values: number[]) => values.every((v) => v >= 30));
	const before = await sql(`SELECT count(*)::int AS n FROM footage WHERE file_name = ANY($1)`, [
		files.map((f) => f.name)
	]);
	expect(before[0].n).toBe(0);

	await page.reload();
	await expect.poll(() => page.getByText('Unfinished uploads from earlier').count()).toBe(1);
	await cdp.detach();
	const cdp2 = await context.newCDPSession(page);
	await cdp2.send('Network.enable');
	await cdp2.send('Network.emulateNetworkConditions', {
		offline: false,
		latency: 0,
		downloadThroughput: -1,
		uploadThroughput: 8 * 1024 * 1024
	});
	await page.getByTestId('upload-input').setInputFiles(files.map((f) => f.file));
	await expect.poll(() => page.getByTestId('upload-row').count()).toBe(2);
	await expect
		.poll(() => page.getByText(/Continued from \d+%/).count(), { timeout: 20_000 })
		.toBe(2);
	await expect
		.poll(() => page.locator('[data-testid="upload-row"][data-state="done"]').count(), {
			timeout: 60_000
		})
		.toBe(2);

	const rowsAfter = await sql(
		`SELECT file_name, sha256 FROM footage WHERE file_name = ANY($1) ORDER BY file_name`,
		[files.map((f) => f.name)]
	);
	expect(rowsAfter).toEqual(
		files
			.map((f) => ({ file_name: f.name, sha256: f.sha }))
			.sort((a, b) => a.file_name.localeCompare(b.file_name))
	);
	// The table refreshes with both clips.
	await expect
		.poll(() => page.getByRole('cell', { name: /bay3-a-cam-0412/ }).count())
		.toBeGreaterThan(0);
});
