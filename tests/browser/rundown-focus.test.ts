/**
 * The rundown's ↑ and ↓ buttons move a row and keep keyboard focus on the button that was pressed,
 * in the moved row, instead of dropping it on the page (WCAG 2.2 SC 2.4.3 Focus Order: focus
 * stays where the person was working).
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

let session: BrowserSession;
let episodeId: string;
const segmentIds: string[] = [];

beforeAll(async () => {
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	[{ id: episodeId }] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage)
		 VALUES ($1, 'Rundown focus test', $2, 600, '29.97', 'script') RETURNING id`,
		[channel.id, `rundown-focus-test-${Date.now()}`]
	);
	for (const [position, title] of ['Cold open', 'Pull the old shocks', 'Road test'].entries()) {
		const [segment] = await sql(
			`INSERT INTO segment (episode_id, position, kind, title) VALUES ($1, $2, 'install-step', $3) RETURNING id`,
			[episodeId, position + 1, title]
		);
		// Every segment has its script row (the rundown reads them together).
		await sql(`INSERT INTO segment_script (segment_id) VALUES ($1)`, [segment.id]);
		segmentIds.push(segment.id);
	}
	session = await openBrowser();
	await signInAs(session.page, demo.producer);
});

afterAll(async () => {
	await session?.close();
	await sql(`DELETE FROM episode WHERE slug LIKE 'rundown-focus-test-%'`);
});

const savedOrder = async () =>
	(await sql(`SELECT id FROM segment WHERE episode_id = $1 ORDER BY position`, [episodeId])).map(
		(row) => row.id
	);
const focusedId = () => session.page.evaluate(() => document.activeElement?.id ?? '');

test('after pressing ↑ on a row, focus is on that row’s ↑ button, and the order is saved', async () => {
	const page = session.page;
	await page.goto(`/episodes/${episodeId}/rundown`);
	const [first, second, third] = segmentIds;
	await page.getByRole('button', { name: 'Move “Road test” up' }).focus();
	await page.keyboard.press('Enter');
	await expect.poll(savedOrder).toEqual([first, third, second]);
	await expect.poll(focusedId).toBe(`move-up-${third}`);
	const rows = await page.getByTestId('rundown').locator('li').allTextContents();
	expect(rows[1]).toContain('Road test');
});

test('after pressing ↓, focus is on that row’s ↓ button', async () => {
	const page = session.page;
	await page.goto(`/episodes/${episodeId}/rundown`);
	const before = await savedOrder();
	const top = before[0];
	await page.locator(`#move-down-${top}`).focus();
	await page.keyboard.press('Space');
	await expect.poll(savedOrder).toEqual([before[1], top, before[2]]);
	await expect.poll(focusedId).toBe(`move-down-${top}`);
	const rows = await page.getByTestId('rundown').locator('li').allTextContents();
	expect(rows[1]).toContain((await sql(`SELECT title FROM segment WHERE id = $1`, [top]))[0].title);
});
