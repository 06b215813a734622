/**
 * In a real browser: the editor opens a demo episode's timeline, types the cut's length, marks
 * three chapters with the keyboard at the playhead and downloads the description text.
 *
 * Expected times use the exact rate 30000/1001 (tests/REFERENCES.md, "Frame rates"): ten seconds
 * are 299.7 frames, so a Shift+→ from a whole frame lands 300 frames on, and → lands 30 frames on
 * (29.97 → 30). Timecode labels are checked with the npm package `smpte-timecode` (SMPTE ST 12-1
 * drop-frame).
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, switchChannel, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

const require = createRequire(import.meta.url);
const smpte = require('smpte-timecode') as (
	frames: number,
	rate: [number, number],
	dropFrame: boolean
) => { toString(): string };
const dropFrameLabel = (frames: number) => smpte(frames, [30000, 1001], true).toString();

let browser: BrowserSession;
beforeAll(async () => {
	browser = await openBrowser();
});
afterAll(async () => browser?.close());

test('the editor marks three chapters with the keyboard and downloads the txt export', async () => {
	const { page } = browser;
	const [episode] = await sql(
		`SELECT id, cut_duration_frames FROM episode WHERE slug = 'mule-285-tyres'`
	);
	expect(episode.cut_duration_frames).toBeNull();
	expect(await sql(`SELECT id FROM chapter WHERE episode_id = $1`, [episode.id])).toEqual([]);

	await signInAs(page, demo.editor);
	// The shared editor starts in the other channel (channels sort by name): switch like a person would.
	await switchChannel(page, 'Torquehaven Garage');
	await page.goto(`/episodes/${episode.id}/edit`);
	expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Edit timeline');
	expect(await page.title()).toContain('Fitting 285/70R17 tyres');

	// Typed as a clock time: 660 s × 30000/1001 = 19780.2 → frame 19780.
	await page.getByLabel('Set the length').fill('11:00');
	await page.getByRole('button', { name: 'Set length' }).click();
	const timeline = page.getByRole('slider', { name: 'Playhead on the cut' });
	await timeline.waitFor();
	expect(await timeline.getAttribute('aria-valuemax')).toBe('19780');

	const rows = page.locator('[data-chapter-row]');
	const playhead = page.getByTestId('playhead-timecode');
	async function markAt(expectedFrame: number, title: string, count: number) {
		expect(await playhead.textContent()).toBe(dropFrameLabel(expectedFrame));
		await page.keyboard.press('m');
		await page
			.getByLabel(`Title for the new chapter at ${dropFrameLabel(expectedFrame)}`)
			.waitFor();
		await page.keyboard.type(title);
		await page.keyboard.press('Enter');
		await expect.poll(() => rows.count()).toBe(count);
		// Focus comes back to the playhead, so the next key press moves it.
		await expect
			.poll(() => page.evaluate(() => document.activeElement?.getAttribute('role')))
			.toBe('slider');
	}

	await timeline.focus();
	await markAt(0, 'Cold open', 1);

	for (let step = 0; step < 3; step++) await page.keyboard.press('Shift+ArrowRight');
	for (let step = 0; step < 5; step++) await page.keyboard.press('ArrowRight');
	// 3 × 300 + 5 × 30 = 1050 frames, 00:00:35;00.
	await markAt(1050, 'Tyre sizes, by the numbers', 2);

	for (let step = 0; step < 9; step++) await page.keyboard.press('Shift+ArrowRight');
	await page.keyboard.press('.');
	await page.keyboard.press(',');
	// 1050 + 9 × 300 = 3750 frames; one frame forward and back again.
	await markAt(3750, 'Speedometer check', 3);

	expect(await page.getByText('Every rule met: ready to download.').count()).toBe(1);
	const saved = await sql(
		`SELECT start_frame, title FROM chapter WHERE episode_id = $1 ORDER BY start_frame`,
		[episode.id]
	);
	expect(saved).toEqual([
		{ start_frame: 0, title: 'Cold open' },
		{ start_frame: 1050, title: 'Tyre sizes, by the numbers' },
		{ start_frame: 3750, title: 'Speedometer check' }
	]);

	await page.getByText('Download chapters').click();
	const [download] = await Promise.all([
		page.waitForEvent('download'),
		page.getByRole('link', { name: /Description text/ }).click()
	]);
	expect(download.suggestedFilename()).toBe('mule-285-tyres-chapters.txt');
	const text = readFileSync((await download.path())!, 'utf8');
	// 1050 frames = 35.035 s and 3750 frames = 125.125 s at 30000/1001; description timestamps are
	// whole seconds from 0:00 (common practice of video platforms).
	expect(text).toBe('0:00 Cold open\n0:35 Tyre sizes, by the numbers\n2:05 Speedometer check\n');

	// A chapter picked with ] stays the target only while the playhead is inside it.
	await timeline.focus();
	await page.keyboard.press('Home');
	await page.keyboard.press(']'); // picks chapter 2 and puts the playhead on it
	for (let step = 0; step < 9; step++) await page.keyboard.press('Shift+ArrowRight'); // 1050 + 2700 = 3750: inside chapter 3
	await page.keyboard.press('Enter');
	await page.getByLabel('New title for chapter 3 “Speedometer check”').waitFor();
	await page.keyboard.press('Escape');

	// Two chapters removed one after the other come back with Z, Z, newest first.
	await timeline.focus();
	await page.keyboard.press('Delete'); // chapter 3 (under the playhead)
	await expect.poll(() => rows.count()).toBe(2);
	await page.keyboard.press('[');
	await page.keyboard.press('Delete'); // chapter 2, picked with [
	await expect.poll(() => rows.count()).toBe(1);
	await page.keyboard.press('z');
	await expect.poll(() => rows.count()).toBe(2);
	await page.keyboard.press('z');
	await expect.poll(() => rows.count()).toBe(3);
	expect(
		await sql(`SELECT start_frame, title FROM chapter WHERE episode_id = $1 ORDER BY start_frame`, [
			episode.id
		])
	).toEqual(saved);
	await page.keyboard.press('z');
	await expect.poll(() => page.getByRole('status').textContent()).toContain('Nothing to put back');
});
