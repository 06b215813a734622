/**
 * Layout problems found when the product was tried as each role, measured in a real browser:
 * what must be visible is inside the viewport, text is not cut off, labels do not push fields out
 * of line, labels do not overlap, and the pages of one episode head themselves the same way.
 * Boxes are CSS pixels from getBoundingClientRect (CSSOM View); "cut off" is scrollWidth or
 * scrollHeight beyond the element's client box (CSSOM View, scrolling area).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, expect, inject, test } from 'vitest';
import type { Page } from 'playwright-core';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

const DESKTOP = { width: 1280, height: 800 };
const PHONE = { width: 390, height: 844 };

let session: BrowserSession | undefined;
let channelId: string;
let muleId: string;
let scratchId: string;
const footageIds: string[] = [];

async function browse(viewport: { width: number; height: number }, email: string): Promise<Page> {
	await session?.close();
	session = await openBrowser(viewport);
	await signInAs(session.page, email);
	return session.page;
}

beforeAll(async () => {
	[{ id: muleId, channel_id: channelId }] = await sql(
		`SELECT id, channel_id FROM episode WHERE title = '3-inch rear block lift on Project Mule'`
	);
	// A cut of 10:20 at 29.97 fps (18,600 frames): the 10:00 tick sits right by the end label.
	[{ id: scratchId }] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
		 VALUES ($1, 'Layout test', $2, 600, '29.97', 'shoot', 18600) RETURNING id`,
		[channelId, `layout-test-${Date.now()}`]
	);
	const [segment] = await sql(
		`INSERT INTO segment (episode_id, position, kind, title) VALUES ($1, 1, 'install-step', 'Pull the old shocks') RETURNING id`,
		[scratchId]
	);
	await sql(
		`INSERT INTO shot (segment_id, what, position) VALUES ($1, 'Close-up: shock bolt', 1) RETURNING id`,
		[segment.id]
	);
	// A clip whose file is on the server, so its row shows Play and Download.
	const uploadId = `layout-test-${Date.now()}`;
	mkdirSync(inject('uploadDir'), { recursive: true });
	writeFileSync(path.join(inject('uploadDir'), uploadId), 'not really video');
	const [clip] = await sql(
		`INSERT INTO footage (channel_id, episode_id, upload_id, purpose, camera_label, clip_name, file_name, file_type, size_bytes, sha256)
		 VALUES ($1, $2, $3, 'footage', 'A-cam', 'ACAM_9902', 'ACAM_9902.mp4', 'video/mp4', 16, $4) RETURNING id`,
		[channelId, muleId, uploadId, 'b'.repeat(64)]
	);
	footageIds.push(clip.id);
});

afterAll(async () => {
	await session?.close();
	if (footageIds.length) await sql(`DELETE FROM footage WHERE id = ANY($1)`, [footageIds]);
	await sql(`DELETE FROM episode WHERE slug LIKE 'layout-test-%'`);
});

test('at 1280 px the footage table shows each clip’s Download button inside the table and the window', async () => {
	const page = await browse(DESKTOP, demo.producer);
	await page.goto(`/episodes/${muleId}/footage`);
	const download = page
		.getByRole('row')
		.filter({ hasText: 'ACAM_9902' })
		.getByRole('link', { name: 'Download' });
	const placed = await download.evaluate((link) => {
		const box = link.getBoundingClientRect();
		const frame = link.closest('.overflow-x-auto')!.getBoundingClientRect();
		return { left: box.left, right: box.right, frameRight: frame.right };
	});
	expect(placed.right).toBeLessThanOrEqual(placed.frameRight);
	expect(placed.right).toBeLessThanOrEqual(DESKTOP.width);
	expect(placed.left).toBeGreaterThanOrEqual(0);
});

test('a drop-frame message under Source in reads as a few wide lines, not a narrow column', async () => {
	const page = await browse(DESKTOP, demo.camera);
	await page.goto(`/episodes/${scratchId}/shots`);
	const form = page.locator('form[action="?/logTake"]');
	await form.getByLabel('Clip').fill('ACAM_2001');
	// 01:01:00;00 does not exist in drop-frame timecode at 29.97 (SMPTE ST 12-1: frames 00 and 01
	// are skipped at the start of each minute not divisible by ten).
	await form.getByLabel('Source in').fill('01:01:00;00');
	await form.getByLabel('Source out').fill('01:01:10;00');
	await form.getByRole('button', { name: 'Log take' }).click();
	const message = form.locator('.field-error', { hasText: 'drop-frame' });
	await message.waitFor();
	const shape = await message.evaluate((element) => ({
		width: element.getBoundingClientRect().width,
		lines: element.getBoundingClientRect().height / parseFloat(getComputedStyle(element).lineHeight)
	}));
	expect(shape.width).toBeGreaterThan(400);
	expect(shape.lines).toBeLessThanOrEqual(4);
	expect(await form.getByLabel('Source in').inputValue()).toBe('01:01:00;00');
});

test('caution wording boxes show all their text, also at the 140-character limit', async () => {
	const page = await browse(DESKTOP, demo.producer);
	const [segment] = await sql(
		`SELECT s.id FROM segment s JOIN caution c ON c.segment_id = s.id WHERE s.episode_id = $1 LIMIT 1`,
		[muleId]
	);
	await page.goto(`/episodes/${muleId}/rundown/${segment.id}`);
	const boxes = page.locator('textarea[name="text"]');
	expect(await boxes.count()).toBeGreaterThan(0);
	const clipped = () =>
		boxes.evaluateAll((areas) =>
			areas
				.map((area) => area as HTMLTextAreaElement)
				.filter(
					(area) =>
						area.scrollHeight > area.clientHeight + 1 || area.scrollWidth > area.clientWidth + 1
				)
				.map((area) => area.id)
		);
	expect(await clipped()).toEqual([]);
	await boxes
		.first()
		.fill('Use rated jack stands on solid, level ground. '.repeat(4).slice(0, 140));
	expect(await clipped()).toEqual([]);
});

test('the storage planner keeps its four fields in line when a label wraps', async () => {
	const page = await browse(DESKTOP, demo.producer);
	const [day] = await sql(`SELECT id FROM shoot_day WHERE episode_id = $1 LIMIT 1`, [muleId]);
	await page.goto(`/shoots/${day.id}`);
	const tops = await page
		.getByTestId('planner-inputs')
		.locator('input.field')
		.evaluateAll((inputs) => inputs.map((input) => Math.round(input.getBoundingClientRect().top)));
	expect(tops).toHaveLength(4);
	expect(new Set(tops).size).toBe(1);
});

test('on a phone the timeline’s end label does not overlap the label of the last tick', async () => {
	const page = await browse(PHONE, demo.editor);
	await page.goto(`/episodes/${scratchId}/edit`);
	const overlaps = await page.evaluate(() => {
		const end = document.querySelector('[data-ruler-end]')!.getBoundingClientRect();
		return [...document.querySelectorAll('[data-ruler-label]')]
			.map((label) => ({ text: label.textContent, box: label.getBoundingClientRect() }))
			.filter(({ box }) => box.right > end.left && box.left < end.right)
			.map(({ text }) => text);
	});
	expect(await page.locator('[data-ruler-end]').textContent()).toBe('10:20');
	expect(overlaps).toEqual([]);
});

test('a person with one role gets a bench as wide as the page, not half of it', async () => {
	const page = await browse(DESKTOP, demo.producer);
	await page.goto('/');
	const widths = await page.evaluate(() => ({
		card: document.querySelector('[data-testid="bench-card"]')!.getBoundingClientRect().width,
		main: document.querySelector('main')!.getBoundingClientRect().width
	}));
	// main has 16 px of padding each side (px-4).
	expect(widths.card).toBeGreaterThanOrEqual(widths.main - 32 - 1);
});

test('every tab of an episode heads its page with the tab’s own name, at one size', async () => {
	const page = await browse(DESKTOP, demo.producer);
	await page.goto(`/episodes/${muleId}`);
	const tabs = await page
		.getByRole('navigation', { name: 'Episode' })
		.getByRole('link')
		.evaluateAll((links) =>
			links.map((link) => ({ href: link.getAttribute('href')!, label: link.textContent!.trim() }))
		);
	expect(tabs.length).toBeGreaterThanOrEqual(10);
	const sizes = new Set<string>();
	for (const tab of tabs) {
		await page.goto(tab.href);
		const heading = page.getByRole('heading', { level: 1 });
		const expected =
			tab.label === 'Overview' ? '3-inch rear block lift on Project Mule' : tab.label;
		expect((await heading.textContent())?.trim(), tab.href).toBe(expected);
		sizes.add(await heading.evaluate((element) => getComputedStyle(element).fontSize));
	}
	expect([...sizes]).toHaveLength(1);
});
