/**
 * The cut review as the crew does it, in Chromium: the editor uploads v1 through the footage page
 * with a change note; the producer and the host comment at three moments (C at the playhead, and a
 * typed timecode); the editor uploads v2 and the comments come over, marked as carried; two are
 * resolved and one answered "won't change" with a reason; the producer approves v2; the episode
 * moves to Locked through its production line.
 *
 * Timecode labels: SMPTE ST 12-1 drop-frame at 29.97, checked with the npm package
 * `smpte-timecode` (the spec itself is paywalled): frame 30 is 00:00:01;00, 45 is 00:00:01;15.
 */
import { createRequire } from 'node:module';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { openBrowser, signInAs, switchChannel, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';
import { FFMPEG } from '../helpers/media';
import { cutClip } from '../helpers/cut-review';

const require = createRequire(import.meta.url);
const Timecode = require('smpte-timecode') as (
	frames: number,
	rate: number,
	dropFrame: boolean
) => { toString(): string };
const label = (frame: number) => Timecode(frame, 29.97, true).toString();

let browser: BrowserSession;
const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-browser-screening-'));
let episodeId = '';

beforeAll(async () => {
	browser = await openBrowser();
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	const slug = `screening-${Date.now()}`;
	// No segments, and three chapters 10 minutes apart in a 30-minute cut, so the lock gate has
	// nothing to say but the review's own rules.
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
		 VALUES ($1, 'Screening test: skid plate', $2, 1800, '29.97', 'edit', 53946) RETURNING id`,
		[channel.id, slug]
	);
	episodeId = episode.id;
	for (const [frame, title] of [
		[0, 'Why a skid plate'],
		[17982, 'Bolting it up'],
		[35964, 'On the trail']
	])
		await sql(`INSERT INTO chapter (episode_id, start_frame, title) VALUES ($1, $2, $3)`, [
			episodeId,
			frame,
			title
		]);
});
afterAll(async () => {
	await browser?.close();
	rmSync(work, { recursive: true, force: true });
});

async function as(email: string) {
	await browser.context.clearCookies();
	await signInAs(browser.page, email);
	// Only the editor works for two channels (and sees the channel picker).
	if (email === demo.editor) await switchChannel(browser.page, 'Torquehaven Garage');
}

async function uploadCut(page: Page, file: string, note: string, number: number) {
	await page.goto(`/episodes/${episodeId}/footage`);
	// The editor may upload only cuts, so the page asks no "What".
	expect(await page.getByLabel('What', { exact: true }).count()).toBe(0);
	await page.getByLabel('What changed in this version').fill(note);
	await page.getByTestId('upload-input').setInputFiles(file);
	await expect
		.poll(
			async () =>
				(await sql(`SELECT number FROM cut_version WHERE episode_id = $1`, [episodeId])).length,
			{ timeout: 60_000 }
		)
		.toBe(number);
}

async function playerReady(page: Page) {
	const video = page.getByTestId('clip-player').first().locator('video');
	await expect
		.poll(() => video.evaluate((v: HTMLVideoElement) => v.readyState), { timeout: 20_000 })
		.toBeGreaterThanOrEqual(2);
}

async function comment(page: Page, at: string | null, body: string) {
	if (at === null) {
		// C at the playhead: the player has the keys once focused.
		await page.getByTestId('clip-player').first().getByRole('group').first().focus();
		await page.keyboard.press('c');
		// The player stands at the first frame, so C fills in its label.
		await expect.poll(() => page.getByLabel('At', { exact: true }).inputValue()).toBe(label(0));
	} else await page.getByLabel('At', { exact: true }).fill(at);
	await page.getByLabel('Comment', { exact: true }).fill(body);
	await page.getByRole('button', { name: 'Add comment' }).click();
	await expect.poll(() => page.getByText(body).count()).toBeGreaterThan(0);
}

describe.skipIf(!existsSync(FFMPEG))('screening', () => {
	test('v1, three comments, v2 with the comments carried, answers, approval, picture lock', async () => {
		const { page } = browser;
		await as(demo.editor);
		await uploadCut(page, cutClip(path.join(work, 'skid-v1.mp4')), 'First assembly', 1);

		// The producer comments at the first frame with C, then at a typed moment.
		await as(demo.producer);
		await page.goto(`/episodes/${episodeId}/screening`);
		await expect.poll(() => page.getByText('Playing v1').isVisible()).toBe(true);
		await playerReady(page);
		await comment(page, null, 'Open on the skid plate, not the bench.');
		await comment(page, label(30), 'Torque figure should be on screen here.');

		// The host comments at a third moment and mentions the editor through the picker.
		await as(demo.host);
		await page.goto(`/episodes/${episodeId}/screening`);
		await page.getByLabel('At', { exact: true }).fill(label(45));
		await page.getByLabel('Mention (they get a mail)').selectOption('Jules Farrow');
		expect(await page.getByLabel('Comment', { exact: true }).inputValue()).toBe('@Jules Farrow ');
		await page.getByLabel('Comment', { exact: true }).pressSequentially('I said the wrong size.');
		await page.getByRole('button', { name: 'Add comment' }).click();
		await expect
			.poll(() => page.locator('li[id^="comment-"]', { hasText: 'I said the wrong size.' }).count())
			.toBe(1);
		await expect.poll(() => page.getByTestId('comment-mark').count()).toBe(3);
		expect(
			Number(
				(
					await sql(
						`SELECT count(*)::int AS n FROM outbox WHERE to_address = 'jules@cutbench.test' AND subject LIKE '%mentioned you%'`
					)
				)[0].n
			)
		).toBeGreaterThanOrEqual(1);

		// v2 arrives; the three comments come over, marked as carried, and show on the edit timeline.
		await as(demo.editor);
		await uploadCut(page, cutClip(path.join(work, 'skid-v2.mp4')), 'Opened on the plate', 2);
		await page.goto(`/episodes/${episodeId}/screening`);
		await expect.poll(() => page.getByText('Playing v2').isVisible()).toBe(true);
		await expect.poll(() => page.getByTestId('carried').count()).toBe(3);
		await expect
			.poll(async () => (await page.getByTestId('carried').first().textContent())?.trim())
			.toBe('carried from v1');
		await page.goto(`/episodes/${episodeId}/edit`);
		await expect
			.poll(async () => (await page.getByTestId('current-cut').textContent()) ?? '')
			.toContain('Working on v2');
		await expect
			.poll(async () => (await page.getByTestId('current-cut').textContent()) ?? '')
			.toContain('3 open comments');

		// v1 and v2 side by side, locked at the same timecode.
		await page.goto(`/episodes/${episodeId}/screening?v=2&beside=1`);
		await playerReady(page);
		await page.getByTestId('clip-player').first().getByRole('group').first().focus();
		await page.keyboard.press('Shift+ArrowRight');
		const readouts = page.getByTestId('player-timecode');
		await expect.poll(() => readouts.nth(0).textContent()).toBe(label(30));
		await expect.poll(() => readouts.nth(1).textContent()).toBe(label(30));

		// Two resolved, one won't change with its reason (refused without one).
		await page.goto(`/episodes/${episodeId}/screening`);
		const items = page.locator('li[id^="comment-"]');
		await items.nth(0).getByRole('button', { name: 'Resolved' }).click();
		await expect
			.poll(async () => (await items.nth(0).getByTestId('comment-state').textContent())?.trim())
			.toBe('resolved');
		await items.nth(1).getByRole('button', { name: 'Resolved' }).click();
		await expect
			.poll(async () => (await items.nth(1).getByTestId('comment-state').textContent())?.trim())
			.toBe('resolved');
		await items.nth(2).getByRole('button', { name: "Won't change" }).click();
		await expect
			.poll(async () => (await items.nth(2).locator('.field-error').textContent()) ?? '')
			.toContain('Say why');
		await items.nth(2).getByLabel("Reason it won't change").fill('The size is in the captions.');
		await items.nth(2).getByRole('button', { name: "Won't change" }).click();
		await expect
			.poll(async () => (await items.nth(2).getByTestId('comment-state').textContent())?.trim())
			.toBe("won't change");

		// The producer approves v2 and locks the picture.
		await as(demo.producer);
		await page.goto(`/episodes/${episodeId}/screening`);
		await page.getByRole('button', { name: 'Approve v2' }).click();
		await expect
			.poll(async () => (await page.getByTestId('approval').first().textContent())?.trim())
			.toBe('approved');
		await page.goto(`/episodes/${episodeId}`);
		await page.getByRole('button', { name: 'Move to Locked' }).click();
		await expect
			.poll(
				async () => (await sql(`SELECT stage FROM episode WHERE id = $1`, [episodeId]))[0].stage
			)
			.toBe('locked');
		await page.goto(`/episodes/${episodeId}/screening`);
		await expect
			.poll(() => page.getByRole('status').filter({ hasText: 'The picture is locked' }).isVisible())
			.toBe(true);
		expect(await page.getByRole('button', { name: 'Add comment' }).count()).toBe(0);
	});
});
