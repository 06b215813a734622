/**
 * Reads what a clip is with ffprobe (Debian's ffmpeg) when it is installed: duration, frame rate
 * (and whether it varies), codec and profile, pixel format, picture size, the start timecode the
 * camera wrote, audio channels and bit rate. Without ffprobe the fields stay empty and the note
 * says why.
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
	videoProfile: string | null;
	pixelFormat: string | null;
	variableFrameRate: boolean | null;
	width: number | null;
	height: number | null;
	startTimecode: string | null;
	audioChannels: number | null;
	bitRate: number | null;
}

const NOTHING_MORE = {
	videoProfile: null,
	pixelFormat: null,
	variableFrameRate: null,
	width: null,
	height: null,
	startTimecode: null,
	audioChannels: null,
	bitRate: null
} as const;

interface ProbeStream {
	codec_type?: string;
	codec_name?: string;
	codec_tag_string?: string;
	profile?: string;
	pix_fmt?: string;
	width?: number;
	height?: number;
	channels?: number;
	r_frame_rate?: string;
	avg_frame_rate?: string;
	duration?: string;
	tags?: Record<string, string>;
}

interface ProbeOutput {
	format?: { duration?: string; bit_rate?: string; tags?: Record<string, string> };
	streams?: ProbeStream[];
}

export async function probeMedia(file: string): Promise<ProbeResult> {
	if (!existsSync(FFPROBE)) {
		return {
			durationSeconds: null,
			frameRate: null,
			videoCodec: null,
			note: 'ffprobe is not installed on the server (apt-get install ffmpeg), so duration, frame rate and codec are not read.',
			...NOTHING_MORE
		};
	}
	try {
		const { stdout } = await run(
			FFPROBE,
			['-v', 'error', '-print_format', 'json', '-show_format', '-show_streams', file],
			{ timeout: 30_000, maxBuffer: 4 * 1024 * 1024 }
		);
		const info = JSON.parse(stdout) as ProbeOutput;
		const video = info.streams?.find((s) => s.codec_type === 'video');
		const audio = info.streams?.find((s) => s.codec_type === 'audio');
		if (!video && !audio) {
			return {
				durationSeconds: null,
				frameRate: null,
				videoCodec: null,
				note: 'ffprobe found no video or audio in this file, so duration, frame rate and codec are empty.',
				...NOTHING_MORE
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
			note: Number.isFinite(duration) ? null : 'ffprobe found no duration in this file.',
			videoProfile: video?.profile ?? null,
			pixelFormat: video?.pix_fmt ?? null,
			variableFrameRate: video ? isVariableRate(video) : null,
			width: positive(video?.width),
			height: positive(video?.height),
			startTimecode: startTimecodeOf(info),
			audioChannels: positive(audio?.channels),
			bitRate: positive(Number(info.format?.bit_rate))
		};
	} catch (failure) {
		return {
			durationSeconds: null,
			frameRate: null,
			videoCodec: null,
			note: `ffprobe could not read this file: ${failure instanceof Error ? failure.message.split('\n')[0] : String(failure)}`,
			...NOTHING_MORE
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

function positive(value: number | undefined): number | null {
	return typeof value === 'number' && Number.isFinite(value) && value > 0
		? Math.round(value)
		: null;
}

function ratio(text: string | undefined): number | null {
	if (!text) return null;
	const [numerator, denominator] = text.split('/').map(Number);
	return numerator > 0 && denominator > 0 ? numerator / denominator : null;
}

/**
 * ffprobe reports the stream's base rate (r_frame_rate) and its average over the file
 * (avg_frame_rate); a constant-rate file has the two equal. More than 0.5 % apart means the frames
 * are not evenly spaced (phones and screen recorders do this). A heuristic: ffprobe does not read
 * every packet to say for sure.
 */
function isVariableRate(video: ProbeStream): boolean | null {
	const base = ratio(video.r_frame_rate);
	const average = ratio(video.avg_frame_rate);
	if (base === null || average === null) return null;
	return Math.abs(base - average) / base > 0.005;
}

/** The timecode the camera wrote: a container tag, the video stream's tag, or a timecode track's. */
function startTimecodeOf(info: ProbeOutput): string | null {
	const candidates = [
		info.format?.tags?.timecode,
		...(info.streams ?? []).map((stream) => stream.tags?.timecode)
	];
	const found = candidates.find(
		(tc) => typeof tc === 'string' && /^\d{2}:\d{2}:\d{2}[:;.]\d{2,3}$/.test(tc)
	);
	return found ?? null;
}
