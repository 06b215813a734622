/**
 * In a real browser: the editor uploads an EDL on the edit page, sees what it would change in the
 * chapter list (nothing saved yet), confirms, and the list on the page and in the database follow.
 * A file with a bad row shows that row's line number instead.
 *
 * Timecode: SMPTE ST 12-1 drop-frame at 29.97 from 01:00:00;00 (tests/REFERENCES.md, "Timecode"):
 * 01:01:00;02 is frame 1800 of the cut and 01:08:00;02 frame 14386, both checked with `smpte-timecode`.
 * EDL locator lines: CMX 3600 (tests/REFERENCES.md, "Edit-system exchange"; from memory).
 */
import { createRequire } from 'node:module';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, switchChannel, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

const smpte = createRequire(import.meta.url)('smpte-timecode') as (
	timecode: string,
	rate: [number, number],
	dropFrame: boolean
) => { frameCount: number };
const frameOf = (label: string) => smpte(label, [30000, 1001], true).frameCount - 107892;

let browser: BrowserSession;
let episodeId: string;
const slug = `marker-import-browser-${Date.now()}`;

beforeAll(async () => {
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames, timecode_start)
		 VALUES ($1, 'Rear leaf pack swap', $2, 600, '29.97', 'edit', 20000, '01:00:00:00') RETURNING id`,
		[channel.id, slug]
	);
	episodeId = episode.id;
	for (const [frame, title] of [
		[0, 'Cold open'],
		[1800, 'Tools']
	] as const)
		await sql(`INSERT INTO chapter (episode_id, start_frame, title) VALUES ($1, $2, $3)`, [
			episodeId,
			frame,
			title
		]);
	browser = await openBrowser();
});
afterAll(async () => {
	await browser?.close();
	await sql(`DELETE FROM episode WHERE slug = $1`, [slug]);
});

const edl = (lines: string[]) => ({
	name: 'from-the-bay.edl',
	mimeType: 'text/plain',
	buffer: Buffer.from(['TITLE: Rear leaf pack swap', 'FCM: DROP FRAME', '', ...lines].join('\n'))
});

test('the editor previews an EDL’s chapter changes, then saves them', async () => {
	const { page } = browser;
	await signInAs(page, demo.editor);
	await switchChannel(page, 'Torquehaven Garage');
	await page.goto(`/episodes/${episodeId}/edit`);
	const panel = page.getByTestId('marker-exchange');
	const picker = panel.getByLabel('Bring chapter markers back from an EDL or OpenTimelineIO file');

	// A bad row first: the label ;00 doesn't exist at minute 1 in drop-frame.
	await picker.setInputFiles(edl(['* LOC: 01:01:00;00 CHAPTER Tools and safety gear']));
	const rows = panel.getByTestId('marker-rows');
	await rows.waitFor();
	expect(await rows.textContent()).toMatch(/line 4: .*doesn't exist in drop-frame/);

	await picker.setInputFiles(
		edl([
			'* LOC: 01:00:00;00 CHAPTER Cold open',
			'* LOC: 01:01:00;02 CHAPTER Tools and safety gear',
			'* LOC: 01:08:00;02 CHAPTER Test drive'
		])
	);
	const preview = panel.getByTestId('marker-preview');
	await preview.waitFor();
	const changes = await preview
		.locator('tbody tr')
		.evaluateAll((trs) =>
			trs.map((tr) => [
				tr.getAttribute('data-change'),
				tr.querySelector('td:nth-child(2)')?.textContent?.trim()
			])
		);
	expect(changes).toEqual([
		['unchanged', '01:00:00;00'],
		['renamed', '01:01:00;02'],
		['added', '01:08:00;02']
	]);
	// The preview wrote nothing.
	const before = await sql(`SELECT title FROM chapter WHERE episode_id = $1 ORDER BY start_frame`, [
		episodeId
	]);
	expect(before.map((row) => row.title)).toEqual(['Cold open', 'Tools']);

	await preview.getByRole('button', { name: 'Save 2 changes' }).click();
	await panel.getByText('Saved: 1 new, 0 moved, 1 renamed.').waitFor();
	const after = await sql(
		`SELECT start_frame, title FROM chapter WHERE episode_id = $1 ORDER BY start_frame`,
		[episodeId]
	);
	expect(after.map((row) => [row.start_frame, row.title])).toEqual([
		[0, 'Cold open'],
		[frameOf('01:01:00;02'), 'Tools and safety gear'],
		[frameOf('01:08:00;02'), 'Test drive']
	]);
	expect(frameOf('01:08:00;02')).toBe(14386);
	// The page's chapter list took the new state without a reload.
	await expect.poll(() => page.locator('[data-chapter-row]').count()).toBe(3);
});
