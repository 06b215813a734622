/**
 * In a real browser, with and without JavaScript: the footage page and the crew page show one page
 * of their list and a "More …" link that leads to the next rows (none of the first page's again),
 * and the footage page's camera filter still narrows the list now that the server pages it.
 *
 * The rows live in a channel of this file's own, so the demo channel's lists stay as seeded.
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import type { Page } from 'playwright-core';
import { openBrowser, signInAs } from '../helpers/browser';
import { demo, ownChannel, sql } from '../helpers/http';

const EMAIL = 'more.producer@paging-more.test';
let channelId = '';
let episodeId = '';

beforeAll(async () => {
	({ channelId, episodeId } = await ownChannel({
		channelName: 'Zz more bay',
		email: EMAIL,
		personName: 'Aa More Producer',
		role: 'producer',
		passwordOf: demo.producer,
		episode: { title: 'More bay episode', slug: 'more-bay' }
	}));
	await sql(
		`INSERT INTO footage (channel_id, episode_id, upload_id, purpose, camera_label, clip_name,
		   file_name, file_type, size_bytes, sha256)
		 SELECT $1, $2, 'more-bay-' || i, 'footage', (ARRAY['Deck cam','Pit cam'])[1 + i % 2],
		   'MB_' || lpad(i::text, 3, '0'), 'MB_' || lpad(i::text, 3, '0') || '.mov', 'video/quicktime',
		   1000000, repeat('0', 64)
		 FROM generate_series(1, 70) AS i`,
		[channelId, episodeId]
	);
	await sql(
		`WITH added AS (
		   INSERT INTO person (email, name)
		   SELECT 'more.crew.' || i || '@paging-more.test', 'Bay helper ' || lpad(i::text, 2, '0')
		   FROM generate_series(1, 60) AS i RETURNING id)
		 INSERT INTO membership (channel_id, person_id, roles) SELECT $1, id, ARRAY['camera'] FROM added`,
		[channelId]
	);
});

afterAll(async () => {
	await sql(`DELETE FROM episode WHERE channel_id = $1`, [channelId]);
	await sql(`DELETE FROM membership WHERE channel_id = $1`, [channelId]);
	await sql(`DELETE FROM person WHERE email LIKE '%@paging-more.test'`);
});

/** The clip names the footage table shows, in order. */
async function clipsShown(page: Page): Promise<string[]> {
	const cells = await page.getByRole('cell').allTextContents();
	return cells.flatMap((text) => text.match(/MB_\d{3}\.mov/g) ?? []);
}

async function helpersShown(page: Page): Promise<string[]> {
	const text = (await page.getByRole('region', { name: 'Crew members' }).textContent()) ?? '';
	return text.match(/Bay helper \d{2}/g) ?? [];
}

for (const javaScript of [true, false]) {
	describe(javaScript ? 'with JavaScript' : 'without JavaScript', () => {
		test('“More footage” shows the next 20 clips, none of the first 50 again', async () => {
			const browser = await openBrowser(undefined, { javaScript });
			try {
				const { page } = browser;
				await signInAs(page, EMAIL);
				await page.goto(`/episodes/${episodeId}/footage?sort=clip&direction=asc`);
				const first = await clipsShown(page);
				expect(first).toHaveLength(50);
				expect(first[0]).toBe('MB_001.mov');
				await page.getByRole('link', { name: 'More footage' }).click();
				await page.waitForURL(/after=/);
				await expect.poll(() => clipsShown(page)).toHaveLength(20);
				const second = await clipsShown(page);
				expect(second[0]).toBe('MB_051.mov');
				expect(second.filter((clip) => first.includes(clip))).toEqual([]);
				expect(await page.getByRole('link', { name: 'More footage' }).count()).toBe(0);
				await page.getByRole('link', { name: 'Back to the first page' }).click();
				await expect.poll(async () => (await clipsShown(page))[0]).toBe('MB_001.mov');
			} finally {
				await browser.close();
			}
		});

		test('the camera filter narrows the paged list to that camera', async () => {
			const browser = await openBrowser(undefined, { javaScript });
			try {
				const { page } = browser;
				await signInAs(page, EMAIL);
				await page.goto(`/episodes/${episodeId}/footage?sort=clip&direction=asc`);
				const filter = page.getByRole('form', { name: 'Filter the footage' });
				await filter.getByLabel('Camera').selectOption('Pit cam');
				// Without JavaScript the form is sent with its button; with it, choosing sends it.
				if (!javaScript) await filter.getByRole('button', { name: 'Show' }).click();
				await page.waitForURL(/camera=Pit/);
				// Odd clip numbers were filmed on the pit camera: 35 of them, all on one page.
				await expect.poll(() => clipsShown(page)).toHaveLength(35);
				const shown = await clipsShown(page);
				expect(shown.every((clip) => Number(clip.slice(3, 6)) % 2 === 1)).toBe(true);
			} finally {
				await browser.close();
			}
		});

		test('“More crew” shows the rest of the crew by name', async () => {
			const browser = await openBrowser(undefined, { javaScript });
			try {
				const { page } = browser;
				await signInAs(page, EMAIL);
				await page.goto('/crew');
				// The producer's own name sorts first; 49 helpers fill the first page of 50.
				const first = await helpersShown(page);
				expect(first).toHaveLength(49);
				await page.getByRole('link', { name: 'More crew' }).click();
				await page.waitForURL(/after=/);
				await expect.poll(() => helpersShown(page)).toHaveLength(11);
				const second = await helpersShown(page);
				expect(second[0]).toBe('Bay helper 50');
				expect(second.filter((name) => first.includes(name))).toEqual([]);
			} finally {
				await browser.close();
			}
		});
	});
}
