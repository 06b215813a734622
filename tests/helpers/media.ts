/**
 * Small generated clips (FFmpeg's lavfi test sources: `testsrc` picture, `sine` tone) uploaded
 * over tus the way the footage page does it, and waiting for the media worker's outputs.
 */
import { execFileSync } from 'node:child_process';
import { createReadStream } from 'node:fs';
import path from 'node:path';
import * as tus from 'tus-js-client';
import { expect } from 'vitest';
import type { Visitor } from './http';
import { sql } from './http';

export const FFMPEG = '/usr/bin/ffmpeg';
export const FFPROBE = '/usr/bin/ffprobe';

export interface ClipRecipe {
	seconds: number;
	size: string;
	/** An exact rate for lavfi, e.g. 30000/1001. */
	rate: string;
	video: string[];
	audio?: string[];
	timecode?: string;
	/** The sine tone's frequency (Hz); FFmpeg's `sine` source plays it at 1/8 of full scale. */
	toneHz?: number;
}

/** H.265 Main 10 (10-bit 4:2:0), the kind of file a mirrorless camera writes; not playable in Chromium. */
export const HEVC_10BIT: Omit<ClipRecipe, 'seconds'> = {
	size: '640x360',
	rate: '30000/1001',
	video: ['-c:v', 'libx265', '-pix_fmt', 'yuv420p10le', '-x265-params', 'log-level=error'],
	audio: ['-c:a', 'pcm_s16le'],
	timecode: '01:00:00;00',
	toneHz: 440
};

/** ProRes 422 (intra-frame) at 25 fps, the kind of file an external recorder writes. */
export const PRORES_25: Omit<ClipRecipe, 'seconds'> = {
	size: '640x360',
	rate: '25',
	video: ['-c:v', 'prores_ks', '-profile:v', '2'],
	audio: ['-c:a', 'pcm_s16le'],
	timecode: '10:00:00:00',
	toneHz: 1000
};

export function makeClip(file: string, recipe: ClipRecipe): string {
	const args = [
		'-v',
		'error',
		'-y',
		'-f',
		'lavfi',
		'-i',
		`testsrc=duration=${recipe.seconds}:size=${recipe.size}:rate=${recipe.rate}`
	];
	if (recipe.audio)
		args.push(
			'-f',
			'lavfi',
			'-i',
			`sine=frequency=${recipe.toneHz ?? 440}:duration=${recipe.seconds}:sample_rate=48000`
		);
	args.push(...recipe.video);
	if (recipe.audio) args.push(...recipe.audio);
	if (recipe.timecode) args.push('-timecode', recipe.timecode);
	args.push(file);
	execFileSync(FFMPEG, args);
	return file;
}

/** ffprobe's JSON for a file (streams and format). */
export function probe(file: string): {
	format: { duration?: string; tags?: Record<string, string> };
	streams: Record<string, any>[];
} {
	return JSON.parse(
		execFileSync(
			FFPROBE,
			['-v', 'error', '-print_format', 'json', '-show_format', '-show_streams', file],
			{
				encoding: 'utf8'
			}
		)
	);
}

/** Uploads a file over tus as `visitor` and answers the new footage row's id. */
export function uploadClip(
	visitor: Visitor,
	base: string,
	file: string,
	metadata: Record<string, string>
): Promise<string> {
	return new Promise((resolve, reject) => {
		const upload = new tus.Upload(createReadStream(file), {
			endpoint: `${base}/api/uploads`,
			chunkSize: 4 * 1024 * 1024,
			retryDelays: [],
			headers: { cookie: visitor.cookieHeader(), origin: base },
			metadata: { filename: path.basename(file), filetype: 'video/quicktime', ...metadata },
			onError: reject,
			onSuccess: async () => {
				const id = upload.url!.split('/').pop();
				const [row] = await sql(`SELECT id FROM footage WHERE upload_id = $1`, [id]).catch(() => [
					undefined
				]);
				resolve(row?.id ?? id!);
			}
		});
		upload.start();
	});
}

/** Waits until none of the clip's outputs is waiting or working; answers them by kind. */
export async function waitForOutputs(
	footageId: string,
	query: (text: string, params: unknown[]) => Promise<any[]> = sql,
	timeoutMs = 120_000
): Promise<Record<string, any>> {
	const deadline = Date.now() + timeoutMs;
	for (;;) {
		const rows = await query(`SELECT * FROM media_output WHERE footage_id = $1`, [footageId]);
		if (rows.length > 0 && rows.every((row) => !['waiting', 'working'].includes(row.state)))
			return Object.fromEntries(rows.map((row) => [row.kind, row]));
		expect(
			Date.now(),
			`outputs of ${footageId} still not made: ${JSON.stringify(rows)}`
		).toBeLessThan(deadline);
		await new Promise((done) => setTimeout(done, 500));
	}
}
