/**
 * In a real browser on a phone-sized screen: the camera operator types part of a clip name into the
 * new note's take picker, moves down the list with the arrow key, picks with Enter, writes the note
 * and sees it show that take. The picker's rows are big enough for a gloved finger.
 *
 * Outside sources for the checks: the keys are the WAI-ARIA Authoring Practices' combobox pattern
 * (Down Arrow moves through the list, Enter accepts, Escape closes; tests/REFERENCES.md,
 * "Accessibility", from memory); the row height is WCAG 2.2 SC 2.5.5 Target Size (Enhanced),
 * 44 × 44 CSS px, measured with the CSSOM View module's getBoundingClientRect; with the list open
 * the page has no serious or critical WCAG 2.2 finding by the npm package `axe-core`
 * (tests/REFERENCES.md, "Accessibility").
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, seriousFindings, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, ownChannel, sql } from '../helpers/http';

const EMAIL = 'takes.camera@take-picker-browser.test';
let browser: BrowserSession;
let channelId = '';
let episodeId = '';
let expectedTake: { id: string; clipName: string };

beforeAll(async () => {
	({ channelId, episodeId } = await ownChannel({
		channelName: 'Zz picker browser bay',
		email: EMAIL,
		personName: 'Aa Picker Camera',
		role: 'camera',
		passwordOf: demo.camera,
		episode: { title: 'Picker browser episode', slug: 'picker-browser-test', stage: 'shoot' }
	}));
	const [segment] = await sql<{ id: string }>(
		`INSERT INTO segment (episode_id, position, kind, title) VALUES ($1, 1, 'install-step', 'Hub off') RETURNING id`,
		[episodeId]
	);
	const [shot] = await sql<{ id: string }>(
		`INSERT INTO shot (segment_id, what, position) VALUES ($1, 'Hub nut, close', 1) RETURNING id`,
		[segment.id]
	);
	// 60 takes; the ones typed for are GLV_0010 … GLV_0019, so the second row is GLV_0011, which
	// runs from frame 3300 to 3540 (00:01:50:00–00:01:58:00 at 30 nominal frames a second).
	await sql(
		`INSERT INTO take (shot_id, clip_name, source_in_frames, source_out_frames)
		 SELECT $1, 'GLV_' || lpad(i::text, 4, '0'), i * 300, i * 300 + 240 FROM generate_series(1, 60) AS i`,
		[shot.id]
	);
	[expectedTake] = await sql<{ id: string; clipName: string }>(
		`SELECT id, clip_name AS "clipName" FROM take WHERE shot_id = $1 AND clip_name = 'GLV_0011'`,
		[shot.id]
	);
	browser = await openBrowser({ width: 390, height: 844 });
});

afterAll(async () => {
	await browser?.close();
	await sql(`DELETE FROM episode WHERE channel_id = $1`, [channelId]);
	await sql(`DELETE FROM membership WHERE channel_id = $1`, [channelId]);
	await sql(`DELETE FROM person WHERE email = $1`, [EMAIL]);
	await sql(`DELETE FROM channel WHERE id = $1`, [channelId]);
});

test('the camera operator finds a take by typing, picks it with the keyboard, and the saved note shows it', async () => {
	const { page } = browser;
	await signInAs(page, EMAIL);
	await page.goto(`/episodes/${episodeId}/notes`);
	// The page itself carries none of the episode's takes.
	expect(await page.content()).not.toContain('GLV_00');

	const field = page.getByLabel('Take', { exact: true });
	await field.click();
	await field.pressSequentially('glv_001');
	const list = page.getByRole('listbox', { name: 'Takes found' });
	await expect
		.poll(async () => list.getByRole('option').allTextContents())
		.toEqual(Array.from({ length: 10 }, (_, i) => expect.stringContaining(`GLV_001${i}`)));

	// Big enough for a gloved finger: WCAG 2.2 SC 2.5.5, 44 CSS px.
	const box = await list.getByRole('option').first().boundingBox();
	expect(box!.height).toBeGreaterThanOrEqual(44);
	expect((await seriousFindings(page)).map((finding) => finding.rule)).toEqual([]);

	await field.press('ArrowDown');
	await expect
		.poll(() => field.getAttribute('aria-activedescendant'))
		.toBe(await list.getByRole('option').nth(1).getAttribute('id'));
	await field.press('Enter');
	// Enter picks (the form is not sent yet) and the list closes.
	await expect.poll(() => list.count()).toBe(0);
	expect(await field.inputValue()).toBe('GLV_0011');
	expect(
		await page.locator('form[action="?/create"] input[type="hidden"][name="takeId"]').inputValue()
	).toBe(expectedTake.id);
	expect(await sql(`SELECT id FROM segment_note WHERE episode_id = $1`, [episodeId])).toEqual([]);

	// Escape closes a list that is open again, leaving the pick as it was.
	await field.press('ArrowDown');
	await list.waitFor();
	await field.press('Escape');
	await expect.poll(() => list.count()).toBe(0);

	await page.getByLabel('What is on screen').fill('Hub nut breaking loose, socket readable');
	await page.getByLabel('Source timecode').fill('00:01:52:10');
	await page.getByRole('button', { name: 'Write note' }).click();

	const card = page.locator('article[data-note]', { hasText: 'Hub nut breaking loose' });
	await card.waitFor();
	await expect.poll(() => card.textContent()).toContain('take GLV_0011 at 00:01:52:10');
	const [note] = await sql<{ takeId: string }>(
		`SELECT take_id AS "takeId" FROM segment_note WHERE episode_id = $1`,
		[episodeId]
	);
	expect(note.takeId).toBe(expectedTake.id);
});
