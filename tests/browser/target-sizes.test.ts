/**
 * On a phone (390 × 844 CSS pixels) the shot list with its takes and Log take form, the rundown,
 * the footage table and a shoot day: every control is at least 44 × 44 CSS pixels (WCAG 2.2
 * SC 2.5.5 Target Size (Enhanced)) and none is below 24 × 24 (SC 2.5.8 Target Size (Minimum)).
 * A link inside a sentence is SC 2.5.8's "inline" exception and is left out. A take's Remove
 * button stays at least 24 px from its GOOD / NG button (SC 2.5.8's spacing figure).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { inject } from 'vitest';
import type { Page } from 'playwright-core';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

const PHONE = { width: 390, height: 844 };
const ENHANCED = 44; // WCAG 2.2 SC 2.5.5
const MINIMUM = 24; // WCAG 2.2 SC 2.5.8

interface Target {
	what: string;
	width: number;
	height: number;
}

/**
 * The box of every visible control: links, buttons, fields, summaries. A checkbox or radio is
 * measured by its label, which takes the tap too. Links inside running text are left out.
 */
async function targetsOn(page: Page): Promise<Target[]> {
	return page.evaluate(() => {
		const controls = document.querySelectorAll<HTMLElement>(
			'a[href], button, input:not([type=hidden]), select, textarea, summary'
		);
		const found: { what: string; width: number; height: number }[] = [];
		for (const control of controls) {
			const style = getComputedStyle(control);
			if (style.display === 'none' || style.visibility === 'hidden') continue;
			if (control.closest('.sr-only, noscript')) continue;
			let box = control.getBoundingClientRect();
			if (box.width === 0 && box.height === 0) continue;
			if (control.matches('input[type=checkbox], input[type=radio]')) {
				const label =
					control.closest('label') ??
					(control.id ? document.querySelector(`label[for="${control.id}"]`) : null);
				if (label) box = label.getBoundingClientRect();
			}
			const inSentence =
				control.tagName === 'A' && style.display === 'inline' && control.closest('p') !== null;
			if (inSentence) continue;
			const name = (control.getAttribute('aria-label') ?? control.textContent ?? '').trim();
			found.push({
				what: `${control.tagName.toLowerCase()} “${name.slice(0, 50)}”`,
				width: Math.round(box.width * 10) / 10,
				height: Math.round(box.height * 10) / 10
			});
		}
		return found;
	});
}

let session: BrowserSession | undefined;
let episodeId: string;
let shootDayId: string;
const footageIds: string[] = [];

beforeAll(async () => {
	[{ id: episodeId }] = await sql(
		`SELECT id FROM episode WHERE title = '3-inch rear block lift on Project Mule'`
	);
	[{ id: shootDayId }] = await sql(`SELECT id FROM shoot_day WHERE episode_id = $1 LIMIT 1`, [
		episodeId
	]);
	// A clip whose file is on the server, so the footage table shows its Play and Download buttons.
	const [channel] = await sql(`SELECT channel_id FROM episode WHERE id = $1`, [episodeId]);
	const uploadId = `target-sizes-${Date.now()}`;
	mkdirSync(inject('uploadDir'), { recursive: true });
	writeFileSync(path.join(inject('uploadDir'), uploadId), 'not really video');
	const [row] = await sql(
		`INSERT INTO footage (channel_id, episode_id, upload_id, purpose, clip_name, file_name, file_type, size_bytes, sha256)
		 VALUES ($1, $2, $3, 'footage', 'ACAM_9901', 'ACAM_9901.mp4', 'video/mp4', 16, $4) RETURNING id`,
		[channel.channel_id, episodeId, uploadId, 'a'.repeat(64)]
	);
	footageIds.push(row.id);
});
afterAll(async () => {
	await session?.close();
	if (footageIds.length) await sql(`DELETE FROM footage WHERE id = ANY($1)`, [footageIds]);
});

const pages = [
	['the shot list with takes and Log take', (id: string) => `/episodes/${id}/shots`],
	['the rundown', (id: string) => `/episodes/${id}/rundown`],
	['the footage table', (id: string) => `/episodes/${id}/footage`]
] as const;

for (const [who, email] of [
	['camera operator', demo.camera],
	['producer', demo.producer]
] as const) {
	test(`on a phone, as the ${who}, controls are 44 × 44 px or more (WCAG 2.2 SC 2.5.5) and never under 24 (SC 2.5.8)`, async () => {
		await session?.close();
		session = await openBrowser(PHONE);
		const page = session.page;
		await signInAs(page, email);
		const small: Record<string, Target[]> = {};
		let measured = 0;
		for (const url of [...pages.map(([, to]) => to(episodeId)), `/shoots/${shootDayId}`]) {
			expect((await page.goto(url))?.status(), url).toBe(200);
			const targets = await targetsOn(page);
			measured += targets.length;
			const under = targets.filter((target) => target.width < ENHANCED || target.height < ENHANCED);
			if (under.length) small[url] = under;
		}
		expect(measured).toBeGreaterThan(50);
		expect(small).toEqual({});
	});
}

test('on a phone the edit timeline’s marks are 24 × 24 px or more (WCAG 2.2 SC 2.5.8 minimum)', async () => {
	// The marks sit on a dense strip, so the enhanced 44 px would overlap neighbours; the minimum
	// holds for every control of the edit page, the marks included.
	await session?.close();
	session = await openBrowser(PHONE);
	const page = session.page;
	await signInAs(page, demo.editor);
	expect((await page.goto(`/episodes/${episodeId}/edit`))?.status()).toBe(200);
	const targets = await targetsOn(page);
	expect(targets.length).toBeGreaterThan(5);
	expect(targets.filter((target) => target.width < MINIMUM || target.height < MINIMUM)).toEqual([]);
});

test('on a phone a take’s Remove button is on its own line, at least 24 px from GOOD / NG (SC 2.5.8 spacing)', async () => {
	await session?.close();
	session = await openBrowser(PHONE);
	const page = session.page;
	await signInAs(page, demo.camera);
	await page.goto(`/episodes/${episodeId}/shots`);
	const takes = page.getByTestId('take');
	expect(await takes.count()).toBeGreaterThan(0);
	for (const take of (await takes.all()).slice(0, 4)) {
		const good = await take.locator('button[aria-pressed]').boundingBox();
		const remove = await take.getByRole('button', { name: /^Remove take/ }).boundingBox();
		expect(good).not.toBeNull();
		expect(remove).not.toBeNull();
		// Remove starts below GOOD / NG, with at least SC 2.5.8's 24 px between them.
		expect(remove!.y - (good!.y + good!.height)).toBeGreaterThanOrEqual(MINIMUM);
	}
});
