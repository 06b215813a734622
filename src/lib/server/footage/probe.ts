/**
 * Reads duration, frame rate and codec with ffprobe (Debian's ffmpeg) when it is installed.
 * Without it the fields stay empty and the note says why.
 */
import { execFile } from 'node:child_process';
import { existsSync } from 'node:fs';
import { promisify } from 'node:util';

const run = promisify(execFile);
const FFPROBE = process.env.FFPROBE_PATH ?? '/usr/bin/ffprobe';

export interface ProbeResult {
	durationSeconds: number | null;
	frameRate: string | null;
	videoCodec: string | null;
	note: string | null;
}

export async function probeMedia(file: string): Promise<ProbeResult> {
	if (!existsSync(FFPROBE)) {
		return {
			durationSeconds: null,
			frameRate: null,
			videoCodec: null,
			note: 'ffprobe is not installed on the server (apt-get install ffmpeg), so duration, frame rate and codec are not read.'
		};
	}
	try {
		const { stdout } = await run(
			FFPROBE,
			['-v', 'error', '-print_format', 'json', '-show_format', '-show_streams', file],
			{ timeout: 30_000, maxBuffer: 4 * 1024 * 1024 }
		);
		const info = JSON.parse(stdout) as {
			format?: { duration?: string };
			streams?: {
				codec_type?: string;
				codec_name?: string;
				r_frame_rate?: string;
				avg_frame_rate?: string;
				duration?: string;
			}[];
		};
		const video = info.streams?.find((s) => s.codec_type === 'video');
		const audio = info.streams?.find((s) => s.codec_type === 'audio');
		if (!video && !audio) {
			return {
				durationSeconds: null,
				frameRate: null,
				videoCodec: null,
				note: 'ffprobe found no video or audio in this file, so duration, frame rate and codec are empty.'
			};
		}
		const duration = Number(info.format?.duration ?? video?.duration ?? audio?.duration);
		return {
			durationSeconds: Number.isFinite(duration) ? duration : null,
			frameRate: video
				? frameRateLabel(
						video.avg_frame_rate && video.avg_frame_rate !== '0/0'
							? video.avg_frame_rate
							: video.r_frame_rate
					)
				: null,
			videoCodec: video?.codec_name ?? audio?.codec_name ?? null,
			note: Number.isFinite(duration) ? null : 'ffprobe found no duration in this file.'
		};
	} catch (failure) {
		return {
			durationSeconds: null,
			frameRate: null,
			videoCodec: null,
			note: `ffprobe could not read this file: ${failure instanceof Error ? failure.message.split('\n')[0] : String(failure)}`
		};
	}
}

/**
 * "30000/1001" → "29.97"; "25/1" → "25"; "120/1" → "120". Only a positive rate gets a label: the
 * footage table's check accepts a plain decimal with up to three places, or null.
 */
export function frameRateLabel(ratio: string | undefined): string | null {
	if (!ratio) return null;
	const [numerator, denominator] = ratio.split('/').map(Number);
	if (!numerator || !denominator) return null;
	const fps = numerator / denominator;
	if (!(fps > 0)) return null;
	return String(Math.round(fps * 1000) / 1000);
}
