/**
 * The Storage page in headless Chromium: the quota bar and each episode's stacked bar are drawn
 * (segments with widths in proportion to their bytes) and read as images with text alternatives
 * (role "img" with an accessible name: WCAG 2.2 SC 1.1.1 Non-text Content), and the
 * page fits a phone without sideways scrolling (WCAG 2.2 SC 1.4.10 Reflow).
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo } from '../helpers/http';
import { channelOf, removeEpisodes, storageEpisode } from '../helpers/storage-fixture';

const GB = 1e9; // NIST SP 811 §4
const created: string[] = [];
const sessions: BrowserSession[] = [];
let episodeId = '';

beforeAll(async () => {
	const channelId = await channelOf('mule-rear-block-lift');
	episodeId = await storageEpisode(channelId, {
		title: 'Storage page test: radiator core swap',
		stage: 'shoot',
		// 30 GB of rushes and a 10 GB cut: the rushes segment is three times as wide as the cut.
		clips: [
			{ purpose: 'footage', bytes: 30 * GB },
			{ purpose: 'cut', bytes: 10 * GB }
		]
	});
	created.push(episodeId);
	created.push(
		await storageEpisode(channelId, {
			title: 'Storage page test: fender liner refit',
			stage: 'published',
			clips: [{ purpose: 'footage', bytes: 5 * GB, made: { proxy: 0.4 * GB } }],
			publishedDaysAgo: 60
		})
	);
});
afterAll(async () => {
	for (const session of sessions) await session.close();
	await removeEpisodes(created);
});

describe('the Storage page', () => {
	for (const viewport of [
		{ width: 1280, height: 800 },
		{ width: 390, height: 844 },
		{ width: 320, height: 640 }
	]) {
		test(`draws its bars with text alternatives at ${viewport.width} px`, async () => {
			const session = await openBrowser(viewport);
			sessions.push(session);
			const { page } = session;
			await signInAs(page, demo.producer);
			if (viewport.width >= 1000) {
				await page
					.getByRole('navigation', { name: 'Main' })
					.getByRole('link', { name: 'Storage' })
					.click();
				await page.waitForURL('**/storage');
			} else await page.goto('/storage');
			await expect.poll(() => page.title()).toMatch(/^Storage/);

			const quota = page.getByRole('img', { name: /^Counted against the quota: / });
			expect(await quota.count()).toBe(1);

			const bar = page.getByRole('img', { name: /^Storage page test: radiator core swap: / });
			expect(await bar.getAttribute('aria-label')).toBe(
				// formatBytes keeps one decimal below 100 of a unit: 40 × 10^9 bytes → "40.0 GB".
				'Storage page test: radiator core swap: 40.0 GB in all. Rushes 30.0 GB, Cuts 10.0 GB, Uploads arriving 0 B, Made files 0 B.'
			);
			const widths = await bar.evaluate((element) =>
				[...element.children].map((child) => child.getBoundingClientRect().width)
			);
			// Rushes : cuts = 30 : 10 = 3 : 1 (arithmetic), within a pixel of rounding.
			expect(widths[0]).toBeGreaterThan(0);
			expect(Math.abs(widths[0] - 3 * widths[1])).toBeLessThan(2);
			expect(widths[2]).toBe(0);

			// Published 60 days ago (more than 30): listed with its 5 GB of rushes.
			const archive = await page.getByTestId('archive-list').textContent();
			expect(archive).toContain('Storage page test: fender liner refit');
			expect(archive).toContain('5.0 GB');

			const width = await page.evaluate(() => document.documentElement.scrollWidth);
			expect(width).toBeLessThanOrEqual(viewport.width);
			if (process.env.STORAGE_SCREENSHOTS)
				await page.screenshot({
					path: `${process.env.STORAGE_SCREENSHOTS}/storage-${viewport.width}.png`,
					fullPage: true
				});
		});
	}
});
