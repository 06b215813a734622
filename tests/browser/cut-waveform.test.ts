/**
 * The cut's waveform under the edit timeline, in Chromium. The cut is a generated clip whose sound
 * is a 1 kHz sine at -6 dBFS: amplitude 0.5 of full scale, since dBFS is 20·log10(amplitude / full
 * scale) and 20·log10(0.5) ≈ -6.02 (the definition of dBFS, AES17). Its peaks are then 0.5 of full
 * scale (127 or 128 of 255), and the drawn shape fills half the lane's height. The cut is 4 s long
 * on an 8 s timeline, so the shape spans half the lane's width, and the zoom keeps that ratio.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, signedIn, sql } from '../helpers/http';
import { FFMPEG, uploadClip, waitForOutputs } from '../helpers/media';

const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-cut-waveform-'));
let session: BrowserSession;
let episodeId = '';
let footageId = '';

beforeAll(async () => {
	if (!existsSync(FFMPEG)) return;
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	// 8 s at 25 fps = 200 frames: the cut's length on the timeline.
	[{ id: episodeId }] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
		 VALUES ($1, 'Waveform test', $2, 600, '25', 'edit', 200) RETURNING id`,
		[channel.id, `cut-waveform-test-${Date.now()}`]
	);
	const clip = path.join(work, 'CUT_V1.mov');
	execFileSync(FFMPEG, [
		...['-v', 'error', '-y', '-f', 'lavfi', '-i', 'testsrc=duration=4:size=320x180:rate=25'],
		...['-f', 'lavfi', '-i', 'aevalsrc=0.5*sin(2*PI*1000*t):s=48000:d=4'],
		...['-c:v', 'libx264', '-preset', 'ultrafast', '-c:a', 'pcm_s16le', clip]
	]);
	const editor = await signedIn(demo.producer);
	footageId = await uploadClip(editor, inject('baseUrl'), clip, {
		episodeId,
		purpose: 'cut',
		filetype: 'video/quicktime'
	});
	session = await openBrowser();
	await signInAs(session.page, demo.producer);
}, 120_000);

afterAll(async () => {
	await session?.close();
	await sql(`DELETE FROM episode WHERE slug LIKE 'cut-waveform-test-%'`);
	rmSync(work, { recursive: true, force: true });
});

describe.skipIf(!existsSync(FFMPEG))('the waveform lane', () => {
	test('a cut with sound gets a waveform lane whose drawn extent matches the cut against the timeline', async () => {
		const outputs = await waitForOutputs(footageId);
		expect(outputs.peaks.state, outputs.peaks.message).toBe('done');
		const peaks = await (
			await signedIn(demo.producer)
		).api(`/api/footage/${footageId}/media/peaks`);
		// -6 dBFS = 0.5 of full scale → 0.5 × 255 = 127.5 (dBFS definition; see the file's comment).
		// The first and last slice read a little higher (up to 130): the worker reads the sound
		// resampled to 8 kHz, and the resampler's filter rings at the tone's abrupt start and end.
		const values: number[] = peaks.body.peaks;
		expect(values).toHaveLength(40); // 4 s at 10 peaks a second ($lib/media peaksPerSecond)
		for (const value of values.slice(1, -1)) {
			expect(value).toBeGreaterThanOrEqual(127);
			expect(value).toBeLessThanOrEqual(128);
		}

		const page = session.page;
		await page.goto(`/episodes/${episodeId}/edit`);
		const lane = page.getByTestId('cut-waveform');
		const shape = lane.getByTestId('cut-waveform-shape');
		await expect.poll(() => shape.count(), { timeout: 10_000 }).toBe(1);
		const measure = async () => {
			const [outer, drawn] = [await lane.boundingBox(), await shape.boundingBox()];
			return {
				across: drawn!.width / outer!.width,
				tall: drawn!.height / outer!.height,
				startsAt: drawn!.x - outer!.x
			};
		};
		// 4 s of sound on an 8 s cut: half the lane's width, from its start; half its height.
		const atOne = await measure();
		expect(atOne.across).toBeCloseTo(0.5, 2);
		expect(atOne.startsAt).toBeCloseTo(0, 0);
		expect(atOne.tall).toBeCloseTo(0.5, 1);
		expect(
			await page.getByRole('img', { name: /Waveform of the cut: 4\.0 s of sound/ }).count()
		).toBe(1);

		// Zoomed in, the lane widens with the track and the ratio holds.
		const before = (await lane.boundingBox())!.width;
		await page.getByRole('button', { name: 'Zoom in' }).click();
		await expect.poll(async () => (await lane.boundingBox())!.width).toBeGreaterThan(before * 1.9);
		expect((await measure()).across).toBeCloseTo(0.5, 2);
	});

	test('while the peaks are not made, the lane says so in one quiet line, then draws them once made', async () => {
		await sql(
			`UPDATE media_output SET state = 'waiting' WHERE footage_id = $1 AND kind = 'peaks'`,
			[footageId]
		);
		try {
			const page = session.page;
			await page.goto(`/episodes/${episodeId}/edit`);
			await expect
				.poll(() => page.getByTestId('cut-waveform-state').textContent())
				.toContain('Waveform: waiting for the media worker.');
			expect(await page.getByTestId('cut-waveform-shape').count()).toBe(0);

			// The job finishes while the page stays open: the lane asks again every few seconds
			// and draws the shape, with no reload (the marker set on this document survives).
			await page.evaluate(() => ((window as unknown as { stayed: boolean }).stayed = true));
			await sql(`UPDATE media_output SET state = 'done' WHERE footage_id = $1 AND kind = 'peaks'`, [
				footageId
			]);
			await expect
				.poll(() => page.getByTestId('cut-waveform-shape').count(), { timeout: 15_000 })
				.toBe(1);
			expect(await page.evaluate(() => (window as unknown as { stayed?: boolean }).stayed)).toBe(
				true
			);
		} finally {
			await sql(`UPDATE media_output SET state = 'done' WHERE footage_id = $1 AND kind = 'peaks'`, [
				footageId
			]);
		}
	});
});
