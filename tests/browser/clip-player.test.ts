/**
 * In Chromium: an H.265 10-bit clip (which Chromium can't decode) is uploaded through the footage
 * page, its proxy, poster and thumbnails appear with progress bars, and it plays from the proxy
 * with the camera's source timecode: 01:00:00;00 at the first frame, 01:00:00;01 one frame on
 * (SMPTE ST 12-1 drop-frame labels at 29.97 fps; the clip is made with FFmpeg's `-timecode`).
 */
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';
import { FFMPEG, HEVC_10BIT, makeClip, waitForOutputs } from '../helpers/media';

let browser: BrowserSession;
const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-browser-player-'));

beforeAll(async () => {
	browser = await openBrowser();
});
afterAll(async () => {
	await browser?.close();
	rmSync(work, { recursive: true, force: true });
});

describe.skipIf(!existsSync(FFMPEG))('the clip player', () => {
	test('an H.265 10-bit clip plays from its proxy at the source timecode, stepping frame by frame', async () => {
		const { page } = browser;
		const clip = makeClip(path.join(work, 'ACAM_4001.mov'), { ...HEVC_10BIT, seconds: 4 });
		const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`);
		await signInAs(page, demo.camera);
		await page.goto(`/episodes/${episode.id}/footage`);
		await page.getByTestId('upload-input').setInputFiles(clip);
		await expect
			.poll(
				async () => (await sql(`SELECT id FROM footage WHERE file_name = 'ACAM_4001.mov'`)).length,
				{
					timeout: 60_000
				}
			)
			.toBe(1);
		const [{ id }] = await sql(`SELECT id FROM footage WHERE file_name = 'ACAM_4001.mov'`);
		await waitForOutputs(id);

		// The page looks again while outputs are being made; once done, every bar reads ready.
		const row = page.locator('tr', { hasText: 'ACAM_4001.mov' });
		await expect
			.poll(async () => row.locator('[data-testid="media-status"] li[data-state="done"]').count(), {
				timeout: 30_000
			})
			.toBe(4);

		await row.getByRole('button', { name: 'Play' }).click();
		const player = page.getByTestId('clip-player');
		const video = player.locator('video');
		await expect
			.poll(() => video.evaluate((v: HTMLVideoElement) => v.readyState), { timeout: 20_000 })
			.toBeGreaterThanOrEqual(2);
		expect(await video.evaluate((v: HTMLVideoElement) => v.currentSrc)).toContain('/media/proxy');
		expect(await video.evaluate((v: HTMLVideoElement) => v.videoWidth)).toBeGreaterThan(0);
		const readout = page.getByTestId('player-timecode');
		await expect.poll(() => readout.textContent()).toBe('01:00:00;00');

		await player.getByRole('group').focus();
		await page.keyboard.press('ArrowRight');
		await expect.poll(() => readout.textContent()).toBe('01:00:00;01');
		await page.keyboard.press('Shift+ArrowRight');
		await expect.poll(() => readout.textContent()).toBe('01:00:01;01');
		await page.keyboard.press('ArrowLeft');
		await expect.poll(() => readout.textContent()).toBe('01:00:01;00');

		// Hovering the strip shows a thumbnail with the time under the pointer.
		const strip = page.getByTestId('scrub-strip');
		const box = (await strip.boundingBox())!;
		await page.mouse.move(box.x + box.width * 0.75, box.y + box.height / 2);
		await expect.poll(() => page.getByTestId('scrub-thumbnail').isVisible()).toBe(true);
		expect((await page.getByTestId('scrub-thumbnail').textContent())?.trim()).toMatch(
			/^01:00:0[23];\d\d$/
		);
		if (process.env.PLAYER_SCREENSHOT)
			await page.screenshot({ path: process.env.PLAYER_SCREENSHOT });
	}, 180_000);
});
