/**
 * From upload to watchable footage: a clip a browser can't play (H.265 10-bit) and an intra-frame
 * one (ProRes 422) are probed, get a proxy, a poster frame, a thumbnail sprite and a waveform from
 * the media worker, and are served with range requests to their own channel only.
 *
 * Checked against outside references, not our own code:
 * - ffprobe (Debian's ffmpeg) reads the proxy back: H.264 High / AAC-LC, ≤ 720 lines, yuv420p (the
 *   pixel format browsers decode), and the source's start timecode kept (SMPTE ST 12-1 labels).
 * - FFmpeg's filter documentation: the `sine` source plays at an amplitude of 1/8 of full scale,
 *   so the waveform's peaks read round(255 / 8) = 32 (±1 for rounding of 16-bit samples).
 * - RFC 9110 §14: a Range request gets 206 with Content-Range.
 */
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';
import {
	FFMPEG,
	HEVC_10BIT,
	PRORES_25,
	makeClip,
	probe,
	uploadClip,
	waitForOutputs
} from '../helpers/media';

const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-media-'));
let camera: Visitor;
let other: Visitor;
let episodeId = '';
let hevcId = '';
let proresId = '';

beforeAll(async () => {
	camera = await signedIn(demo.camera);
	other = await signedIn(demo.otherProducer);
	const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`);
	episodeId = episode.id;
}, 60_000);
afterAll(() => rmSync(work, { recursive: true, force: true }));

async function saved(visitor: Visitor, url: string, name: string): Promise<string> {
	const response = await visitor.request(url);
	expect(response.status, url).toBe(200);
	const file = path.join(work, name);
	writeFileSync(file, Buffer.from(await response.arrayBuffer()));
	return file;
}

describe.skipIf(!existsSync(FFMPEG))('the media worker', () => {
	test('probes an H.265 10-bit clip fully and makes a proxy, poster, thumbnails and waveform', async () => {
		const clip = makeClip(path.join(work, 'ACAM_2001.mov'), { ...HEVC_10BIT, seconds: 3 });
		hevcId = await uploadClip(camera, inject('baseUrl'), clip, {
			episodeId,
			cameraLabel: 'A cam',
			clipName: 'ACAM_2001'
		});
		const [row] = await sql(`SELECT * FROM footage WHERE id = $1`, [hevcId]);
		expect(row.video_codec).toBe('hevc');
		expect(row.video_profile).toBe('Main 10');
		expect(row.pixel_format).toBe('yuv420p10le');
		expect([row.width, row.height]).toEqual([640, 360]);
		expect(row.frame_rate).toBe('29.97');
		expect(row.variable_frame_rate).toBe(false);
		expect(row.start_timecode).toBe('01:00:00;00');
		expect(row.audio_channels).toBe(1);
		expect(Number(row.bit_rate)).toBeGreaterThan(0);

		const outputs = await waitForOutputs(hevcId);
		for (const kind of ['proxy', 'poster', 'sprite', 'peaks'])
			expect(outputs[kind].state, `${kind}: ${outputs[kind].message}`).toBe('done');

		const proxy = probe(await saved(camera, `/api/footage/${hevcId}/media/proxy`, 'proxy.mp4'));
		const video = proxy.streams.find((s) => s.codec_type === 'video')!;
		const audio = proxy.streams.find((s) => s.codec_type === 'audio')!;
		expect(video.codec_name).toBe('h264');
		expect(video.profile).toBe('High');
		expect(video.pix_fmt).toBe('yuv420p');
		expect(video.height).toBeLessThanOrEqual(720);
		expect(audio.codec_name).toBe('aac');
		expect(Number(proxy.format.duration)).toBeCloseTo(3, 0);
		const timecodes = [proxy.format.tags?.timecode, ...proxy.streams.map((s) => s.tags?.timecode)];
		expect(timecodes).toContain('01:00:00;00');

		const poster = probe(await saved(camera, `/api/footage/${hevcId}/media/poster`, 'poster.jpg'));
		expect(poster.streams[0].codec_name).toBe('mjpeg');
		expect(poster.streams[0].height).toBe(360);

		const grid = outputs.sprite.details;
		expect(grid).toMatchObject({ interval: 2, count: 2, columns: 2, rows: 1 });
		const sprite = probe(await saved(camera, `/api/footage/${hevcId}/media/sprite`, 'sprite.jpg'));
		expect([sprite.streams[0].width, sprite.streams[0].height]).toEqual([2 * 160, 90]);

		const peaks = await (await camera.request(`/api/footage/${hevcId}/media/peaks`)).json();
		expect(peaks.perSecond).toBe(10);
		expect(peaks.peaks.length).toBeGreaterThanOrEqual(29);
		expect(peaks.peaks.length).toBeLessThanOrEqual(31);
		// The sine source's amplitude is 1/8 of full scale (FFmpeg filter docs): 255 / 8 ≈ 32.
		for (const value of peaks.peaks.slice(1, -1))
			expect(Math.abs(value - 32)).toBeLessThanOrEqual(1);
	}, 180_000);

	test('an intra-frame ProRes clip keeps its 25 fps non-drop timecode', async () => {
		const clip = makeClip(path.join(work, 'BCAM_0301.mov'), { ...PRORES_25, seconds: 2 });
		proresId = await uploadClip(camera, inject('baseUrl'), clip, {
			episodeId,
			cameraLabel: 'B cam',
			clipName: 'BCAM_0301'
		});
		const [row] = await sql(`SELECT * FROM footage WHERE id = $1`, [proresId]);
		expect(row.video_codec).toBe('prores');
		expect(row.frame_rate).toBe('25');
		expect(row.start_timecode).toBe('10:00:00:00');
		const outputs = await waitForOutputs(proresId);
		expect(outputs.proxy.state).toBe('done');
		const proxy = probe(await saved(camera, `/api/footage/${proresId}/media/proxy`, 'p2.mp4'));
		const timecodes = [proxy.format.tags?.timecode, ...proxy.streams.map((s) => s.tags?.timecode)];
		expect(timecodes).toContain('10:00:00:00');
	}, 180_000);

	test('the proxy seeks: a range request gets 206 and just those bytes', async () => {
		expect(hevcId).not.toBe('');
		const response = await camera.request(`/api/footage/${hevcId}/media/proxy`, {
			headers: { range: 'bytes=0-99' }
		});
		expect(response.status).toBe(206);
		expect(response.headers.get('content-range')).toMatch(/^bytes 0-99\/\d+$/);
		expect((await response.arrayBuffer()).byteLength).toBe(100);
		expect(response.headers.get('content-type')).toBe('video/mp4');
	});

	test("another channel's producer gets 404 for the clip's media and status", async () => {
		for (const url of [
			`/api/footage/${hevcId}/media/proxy`,
			`/api/footage/${hevcId}/media`,
			`/api/footage/${hevcId}/media/poster`
		])
			expect((await other.api(url)).status, url).toBe(404);
		expect((await camera.api(`/api/footage/${hevcId}/media/thumbnail`)).status).toBe(400);
		expect((await camera.api(`/api/footage/not-a-uuid/media/proxy`)).status).toBe(404);
	});

	test('the status answers every output with its state; random bytes are skipped with a reason', async () => {
		const status = await camera.api(`/api/footage/${hevcId}/media`);
		expect(status.status).toBe(200);
		expect(status.body.outputs.map((o: { kind: string }) => o.kind)).toEqual([
			'proxy',
			'poster',
			'sprite',
			'peaks'
		]);
		const noise = path.join(work, 'noise.bin');
		writeFileSync(noise, Buffer.alloc(64 * 1024, 7));
		const id = await uploadClip(camera, inject('baseUrl'), noise, {
			episodeId,
			cameraLabel: 'A cam',
			clipName: 'noise'
		});
		const outputs = await waitForOutputs(id);
		expect(Object.values(outputs).every((o) => o.state === 'skipped')).toBe(true);
		expect(outputs.proxy.message).toMatch(/not a clip/i);
	});

	test('deleting the clip removes what was made from it', async () => {
		const producer = await signedIn(demo.producer);
		const result = await producer.action(`/episodes/${episodeId}/footage?/delete`, {
			id: proresId
		});
		expect(result.type).toBe('success');
		expect(await sql(`SELECT 1 FROM media_output WHERE footage_id = $1`, [proresId])).toHaveLength(
			0
		);
		expect(existsSync(path.join(inject('uploadDir'), 'derived', proresId))).toBe(false);
	});
});
