/**
 * Makes each media output from a clip with ffmpeg (Debian's package), reporting progress:
 * - proxy: H.264 High / AAC-LC in MP4, at most 720 lines, the moov atom at the front so a browser
 *   starts playing before the whole file arrives; the source's start timecode kept as metadata.
 * - poster: one JPEG frame a tenth of the way in (at most 5 s), 360 lines high.
 * - sprite: one thumbnail every few seconds (media.ts spriteGridFor), 160×90, tiled into one JPEG.
 * - peaks: the loudest sample in each tenth of a second of the first audio stream, 0–255 of full
 *   scale, as JSON for the waveform.
 * Files are written beside the upload under `derived/<footage id>/` and renamed into place when
 * complete, so a half-made file is never served. A clip in a bucket (footage/object-store.ts) is
 * downloaded to a temporary file, its output made in a temporary folder and uploaded under the same
 * key, and every local file removed.
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { writeFile } from 'node:fs/promises';
import path from 'node:path';
import { db } from '../db';
import { uploadDir } from '../footage/tus-server';
import { derivedKey, storeOf } from '../footage/object-store';
import { peaksPerSecond, spriteGridFor, type MediaKind } from '$lib/media';

const FFMPEG = process.env.FFMPEG_PATH ?? '/usr/bin/ffmpeg';
const SETPRIV = existsSync('/usr/bin/setpriv') ? '/usr/bin/setpriv' : null;

export function ffmpegAvailable(): boolean {
	return existsSync(FFMPEG);
}

export interface MakeContext {
	onProgress(fraction: number): void;
}

export interface Made {
	storageKey: string;
	bytes: number;
	details?: unknown;
}

const FILE_NAMES: Record<MediaKind, string> = {
	proxy: 'proxy.mp4',
	poster: 'poster.jpg',
	sprite: 'sprite.jpg',
	peaks: 'peaks.json'
};

export const OUTPUT_TYPES: Record<MediaKind, string> = {
	proxy: 'video/mp4',
	poster: 'image/jpeg',
	sprite: 'image/jpeg',
	peaks: 'application/json'
};

export function storageKeyFor(footageId: string, kind: MediaKind): string {
	return derivedKey(footageId, FILE_NAMES[kind]);
}

/** The folder of everything made from one clip (removed with the clip). */
export function derivedDir(footageId: string): string {
	return path.join(uploadDir(), 'derived', footageId);
}

interface Source {
	path: string;
	durationSeconds: number;
	startTimecode: string | null;
}

async function clipOf(footageId: string) {
	const row = await db
		.selectFrom('footage')
		.select(['uploadId', 'durationSeconds', 'startTimecode', 'storedIn'])
		.where('id', '=', footageId)
		.executeTakeFirst();
	if (!row) throw new Error('the clip was deleted');
	return row;
}

export async function makeOutput(
	footageId: string,
	kind: MediaKind,
	context: MakeContext
): Promise<Made> {
	const clip = await clipOf(footageId);
	const store = storeOf(clip.storedIn);
	const key = storageKeyFor(footageId, kind);
	const local = await store.localCopy(clip.uploadId);
	try {
		const work = await store.workFile(key);
		try {
			const source: Source = {
				path: local.path,
				durationSeconds: clip.durationSeconds ?? 0,
				startTimecode: clip.startTimecode
			};
			const details = await MAKERS[kind](source, work.path, context);
			const bytes = await store.moveIn(key, work.path, OUTPUT_TYPES[kind]);
			return { storageKey: key, bytes, details };
		} finally {
			await work.release();
		}
	} finally {
		await local.release();
	}
}

type Maker = (source: Source, out: string, context: MakeContext) => Promise<unknown>;

const MAKERS: Record<MediaKind, Maker> = {
	async proxy(source, out, context) {
		const args = [
			'-i',
			source.path,
			'-map',
			'0:v:0',
			'-map',
			'0:a:0?',
			'-vf',
			"scale=-2:'min(720,ih)':flags=bicubic,format=yuv420p",
			'-c:v',
			'libx264',
			'-preset',
			'veryfast',
			'-crf',
			'23',
			'-profile:v',
			'high',
			'-c:a',
			'aac',
			'-b:a',
			'128k',
			'-ac',
			'2',
			'-movflags',
			'+faststart',
			'-f',
			'mp4'
		];
		if (source.startTimecode) args.push('-timecode', source.startTimecode);
		await runFfmpeg([...args, out], source.durationSeconds, context);
		return { startTimecode: source.startTimecode };
	},
	async poster(source, out) {
		const at = Math.min(5, source.durationSeconds / 10);
		await runFfmpeg(
			[
				'-ss',
				at.toFixed(3),
				'-i',
				source.path,
				'-frames:v',
				'1',
				'-vf',
				'scale=-2:360',
				'-q:v',
				'4',
				'-f',
				'mjpeg',
				out
			],
			0,
			null
		);
		return { atSeconds: at };
	},
	async sprite(source, out, context) {
		const grid = spriteGridFor(source.durationSeconds);
		const { tileWidth: w, tileHeight: h } = grid;
		const filter = [
			`fps=1/${grid.interval}`,
			`scale=${w}:${h}:force_original_aspect_ratio=decrease`,
			`pad=${w}:${h}:(ow-iw)/2:(oh-ih)/2:color=black`,
			`tile=${grid.columns}x${grid.rows}`
		].join(',');
		await runFfmpeg(
			['-i', source.path, '-an', '-vf', filter, '-frames:v', '1', '-q:v', '5', '-f', 'mjpeg', out],
			source.durationSeconds,
			context
		);
		return grid;
	},
	async peaks(source, out, context) {
		const perSecond = peaksPerSecond(source.durationSeconds);
		const sampleRate = 8000;
		const slice = sampleRate / perSecond;
		const peaks: number[] = [];
		let loudest = 0;
		let inSlice = 0;
		let carry: Buffer | null = null;
		await runFfmpeg(
			[
				'-i',
				source.path,
				'-map',
				'0:a:0',
				'-ac',
				'1',
				'-ar',
				String(sampleRate),
				'-f',
				's16le',
				'-c:a',
				'pcm_s16le',
				'pipe:3'
			],
			source.durationSeconds,
			context,
			(chunk) => {
				let data = carry ? Buffer.concat([carry, chunk]) : chunk;
				const usable = data.length - (data.length % 2);
				carry = usable < data.length ? data.subarray(usable) : null;
				data = data.subarray(0, usable);
				for (let i = 0; i < data.length; i += 2) {
					const sample = Math.abs(data.readInt16LE(i));
					if (sample > loudest) loudest = sample;
					if (++inSlice === slice) {
						peaks.push(Math.min(255, Math.round((loudest / 32768) * 255)));
						loudest = 0;
						inSlice = 0;
					}
				}
			}
		);
		if (inSlice > 0) peaks.push(Math.min(255, Math.round((loudest / 32768) * 255)));
		const body = { perSecond, durationSeconds: source.durationSeconds, peaks };
		await writeFile(out, JSON.stringify(body));
		return { perSecond, count: peaks.length };
	}
};

/**
 * Runs ffmpeg; with a duration, reads `-progress` on stdout and reports the fraction done. With
 * `onData`, the output written to pipe 3 is handed over as it arrives. Rejects with ffmpeg's last
 * error line.
 */
function runFfmpeg(
	args: string[],
	durationSeconds: number,
	context: MakeContext | null,
	onData?: (chunk: Buffer) => void
): Promise<void> {
	return new Promise((resolve, reject) => {
		const ffmpegArgs = [
			'-hide_banner',
			'-nostdin',
			'-y',
			'-loglevel',
			'error',
			'-progress',
			'pipe:1',
			'-nostats',
			...args
		];
		// ffmpeg dies with the worker (util-linux's setpriv sets the parent-death signal), so a
		// worker killed with SIGKILL leaves no ffmpeg writing on behind the next worker's back.
		const stdio: ('ignore' | 'pipe')[] = ['ignore', 'pipe', 'pipe', 'pipe'];
		const child = SETPRIV
			? spawn(SETPRIV, ['--pdeathsig', 'KILL', '--', FFMPEG, ...ffmpegArgs], { stdio })
			: spawn(FFMPEG, ffmpegArgs, { stdio });
		let errors = '';
		let pending = '';
		child.stdout!.setEncoding('utf8');
		child.stdout!.on('data', (text: string) => {
			pending += text;
			const lines = pending.split('\n');
			pending = lines.pop() ?? '';
			for (const line of lines) {
				const match = /^out_time_(?:us|ms)=(\d+)$/.exec(line.trim());
				if (match && context && durationSeconds > 0)
					context.onProgress(Number(match[1]) / 1e6 / durationSeconds);
			}
		});
		child.stderr!.setEncoding('utf8');
		child.stderr!.on('data', (text: string) => {
			errors = (errors + text).slice(-2000);
		});
		const extra = child.stdio[3] as NodeJS.ReadableStream | null;
		if (extra) {
			if (onData) extra.on('data', (chunk: Buffer) => onData(chunk));
			else extra.resume();
		}
		child.on('error', reject);
		child.on('close', (code, signal) => {
			if (code === 0) resolve();
			else {
				const last =
					errors.trim().split('\n').pop() || `ffmpeg stopped (${signal ?? `exit ${code}`})`;
				reject(new Error(last));
			}
		});
	});
}
