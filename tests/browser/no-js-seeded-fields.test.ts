/**
 * In a real browser with JavaScript switched off, which is also what every visitor sees before a
 * page hydrates: fields and lists that a page fills from saved data show that data in the
 * server-rendered page. The rundown lists its segments and its ↑ ↓ buttons (plain forms) reorder
 * them; a segment's plan shows its saved kind and its caution card its saved wording, so a save
 * without JavaScript sends what was stored, not the first option or an empty card.
 *
 * Expected values are the rows written into the database here. Plain forms that work without
 * JavaScript, upgraded by `use:enhance`, are the SvelteKit form model (SvelteKit docs, "Form
 * actions: Progressive enhancement").
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

let browser: BrowserSession;
let episodeId: string;
const titles = ['Why the bumper bends', 'Cutting the old brackets off', 'Parts and the shop'];
const cautionText = 'Frame on rated stands, never the jack alone.';

beforeAll(async () => {
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	[{ id: episodeId }] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate)
		 VALUES ($1, 'Bumper swap without scripts', $2, 540, '29.97') RETURNING id`,
		[channel.id, `no-js-${Date.now()}`]
	);
	const kinds = ['cold-open', 'install-step', 'call-to-action'];
	for (const [index, title] of titles.entries()) {
		const [segment] = await sql(
			`INSERT INTO segment (episode_id, position, kind, title, hazards)
			 VALUES ($1, $2, $3, $4, $5) RETURNING id`,
			[episodeId, index + 1, kinds[index], title, index === 1 ? ['raised-vehicle'] : []]
		);
		await sql(`INSERT INTO segment_script (segment_id, body) VALUES ($1, '')`, [segment.id]);
		if (index === 1)
			await sql(
				`INSERT INTO caution (segment_id, hazard, text) VALUES ($1, 'raised-vehicle', $2)`,
				[segment.id, cautionText]
			);
	}
	browser = await openBrowser(undefined, { javaScript: false });
	await signInAs(browser.page, demo.producer);
});

afterAll(async () => {
	await browser?.close();
});

const savedOrder = async () =>
	(
		await sql<{ title: string }>(
			`SELECT title FROM segment WHERE episode_id = $1 ORDER BY position`,
			[episodeId]
		)
	).map((row) => row.title);

test('without JavaScript the rundown lists every segment, and ↓ moves one down', async () => {
	const { page } = browser;
	await page.goto(`/episodes/${episodeId}/rundown`);
	const rows = page.getByTestId('rundown').locator('li a.font-bold');
	expect(await rows.allTextContents()).toEqual(titles);

	await page.getByRole('button', { name: `Move “${titles[0]}” down` }).click();
	await page.waitForLoadState();
	const moved = [titles[1], titles[0], titles[2]];
	expect(await savedOrder()).toEqual(moved);
	expect(await rows.allTextContents()).toEqual(moved);
});

test('without JavaScript a segment shows its saved kind and caution wording', async () => {
	const { page } = browser;
	const [segment] = await sql(`SELECT id, kind FROM segment WHERE episode_id = $1 AND title = $2`, [
		episodeId,
		titles[1]
	]);
	await page.goto(`/episodes/${episodeId}/rundown/${segment.id}`);
	expect(segment.kind).toBe('install-step');
	expect(await page.getByLabel('Kind').inputValue()).toBe(segment.kind);
	expect(await page.getByLabel(/Words on screen/).inputValue()).toBe(cautionText);
});
