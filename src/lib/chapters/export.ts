/**
 * Chapter exports: description text, WebVTT, FFmpeg metadata, Podcasting 2.0 JSON and CSV.
 *
 * Every time is computed once from the frame count at the episode's exact rate and rounded once
 * to whole milliseconds (framesToMilliseconds); each chapter ends where the next begins and the
 * last ends at the end of the cut.
 *
 * Title normalisation, the same in every format: line breaks become `\n`, other control
 * characters are removed (a tab becomes a space) and the title is trimmed. The single-line
 * formats (txt, vtt) then turn each line break, with the spaces around it, into one space.
 *
 * Pure module: no I/O, safe in the browser and on the server.
 */

import {
	formatMilliseconds,
	programmeClock,
	programmeTimecode,
	framesToMilliseconds,
	type FrameRate,
	type ProgrammeClock
} from '../timecode';
import { nameChapter, sortChapters, type Chapter } from './rules';
import { csvText } from '../csv';

export type ChapterFormat = 'txt' | 'vtt' | 'ffmetadata' | 'json' | 'csv';

export const CHAPTER_FORMATS: readonly ChapterFormat[] = Object.freeze([
	'txt',
	'vtt',
	'ffmetadata',
	'json',
	'csv'
] as const);

export interface ChapterExportOptions {
	rate: FrameRate;
	cutEndFrame: number;
	/**
	 * Only for the CSV timecode column: the episode's programme timecode (its form and start
	 * offset). Left out: the rate's usual form from 00:00:00:00. Every other format, and the CSV's
	 * seconds, count real time from the start of the cut, as video platforms read chapters.
	 */
	programme?: ProgrammeClock;
	/** Without `programme`: the CSV's form; defaults to drop-frame at 29.97 and 59.94. */
	dropFrame?: boolean;
}

export interface ChapterExport {
	body: string;
	contentType: string;
	extension: string;
}

/** Thrown when a chapter list can't be written in any format; the message says what to fix. */
export class ChapterExportError extends Error {
	constructor(message: string) {
		super(message);
		this.name = 'ChapterExportError';
	}
}

/** A chapter with its times settled: frames and whole milliseconds, start and end. */
interface TimedChapter {
	startFrame: number;
	endFrame: number;
	startMilliseconds: number;
	endMilliseconds: number;
	title: string;
	url: string | null;
}

/** The normalisation every format shares (see the module comment). */
export function normaliseTitle(title: string): string {
	const text = String(title ?? '');
	// Most titles hold no control character at all: then trimming is the whole job.
	if (!/[\u0000-\u001F\u007F]/.test(text)) return text.trim();
	return text
		.replace(/\r\n?/g, '\n')
		.replace(/\t/g, ' ')
		.replace(/[\u0000-\u0008\u000B-\u001F\u007F]/g, '')
		.trim();
}

/** A title on one line: each line break and the spaces around it become one space (txt, vtt). */
export function singleLineTitle(title: string): string {
	return oneLine(normaliseTitle(title));
}

/** singleLineTitle of a title already normalised (normalising twice changes nothing). */
const oneLine = (normalised: string) =>
	normalised.includes('\n') ? normalised.replace(/[ ]*\n[ \n]*/g, ' ') : normalised;

function isWebAddress(text: string): boolean {
	try {
		const { protocol } = new URL(text);
		return protocol === 'http:' || protocol === 'https:';
	} catch {
		return false;
	}
}

/** Sort, check the list can be written at all, and settle every chapter's start and end. */
function timeChapters(chapters: readonly Chapter[], options: ChapterExportOptions): TimedChapter[] {
	const { rate, cutEndFrame } = options;
	if (!Number.isSafeInteger(cutEndFrame) || cutEndFrame <= 0) {
		throw new ChapterExportError(
			'The cut has no length yet; set where the cut ends before exporting chapters.'
		);
	}
	if (chapters.length === 0) {
		throw new ChapterExportError('There are no chapters to export yet; add at least one.');
	}
	// Keep each chapter's position in the list as given, so messages name the chapter the crew sees.
	// A list read in start order (as the server reads it) is used as it is, without a sorted copy.
	const inOrder = chapters.every(
		(chapter, index) => index === 0 || chapters[index - 1].startFrame <= chapter.startFrame
	);
	const sorted = inOrder
		? chapters
		: sortChapters(chapters.map((chapter, position) => ({ ...chapter, position })));
	const positionOf = (index: number) =>
		inOrder ? index : (sorted[index] as Chapter & { position: number }).position;
	return sorted.map((chapter, index) => {
		const position = positionOf(index);
		const name = () => nameChapter(position, chapter.title);
		const start = chapter.startFrame;
		if (!Number.isSafeInteger(start) || start < 0) {
			throw new ChapterExportError(
				`${name()} has no usable start time; set it to a frame inside the cut.`
			);
		}
		if (start >= cutEndFrame) {
			throw new ChapterExportError(
				`${name()} starts at or after the end of the cut; move it earlier or remove it before exporting.`
			);
		}
		const next = sorted[index + 1];
		if (next && next.startFrame === start) {
			throw new ChapterExportError(
				`${name()} and ${nameChapter(positionOf(index + 1), next.title).replace(/^Chapter/, 'chapter')} start on the same frame; move one of them.`
			);
		}
		const title = normaliseTitle(chapter.title);
		if (title === '') {
			throw new ChapterExportError(
				`Chapter ${position + 1} has no title; give it one before exporting.`
			);
		}
		const url =
			typeof chapter.url === 'string' && chapter.url.trim() !== '' ? chapter.url.trim() : null;
		if (url !== null && !isWebAddress(url)) {
			throw new ChapterExportError(
				`${name()} links to “${url}”, which isn't a web address (http:// or https://); fix the link or clear it.`
			);
		}
		const endFrame = next ? next.startFrame : cutEndFrame;
		return {
			startFrame: start,
			endFrame,
			startMilliseconds: framesToMilliseconds(start, rate),
			endMilliseconds: framesToMilliseconds(endFrame, rate),
			title,
			url
		};
	});
}

/** Description timestamps `0:00 Title`, or `0:00:00 Title` on every line when the cut runs an hour or more. */
function toDescriptionText(chapters: TimedChapter[], cutEndMilliseconds: number): string {
	const hours = cutEndMilliseconds >= 3_600_000 ? 'always' : 'auto';
	return chapters
		.map(
			(chapter) =>
				`${formatMilliseconds(chapter.startMilliseconds, { hours })} ${oneLine(chapter.title)}\n`
		)
		.join('');
}

/**
 * WebVTT cue text is parsed for tags and character references (W3C WebVTT, "cue text"), so
 * `&`, `<` and `>` become references. Escaping `>` also means a title can never contain `-->`,
 * which would otherwise be read as a cue timing line.
 */
function escapeWebVttText(text: string): string {
	if (!/[&<>]/.test(text)) return text;
	return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

/** W3C WebVTT chapters track: consecutive cues, `HH:MM:SS.mmm` (always two-digit hours). */
function toWebVtt(chapters: TimedChapter[]): string {
	const timestamp = (milliseconds: number) =>
		formatMilliseconds(milliseconds, { hours: 'always', millis: true });
	const cues = chapters.map(
		(chapter) =>
			`${timestamp(chapter.startMilliseconds)} --> ${timestamp(chapter.endMilliseconds)}\n${escapeWebVttText(oneLine(chapter.title))}\n`
	);
	return `WEBVTT\n\n${cues.join('\n')}`;
}

/**
 * FFmpeg metadata value escaping (ffmpeg-formats, "Metadata"): `=`, `;`, `#`, `\` and newline
 * take a backslash. FFmpeg's reader (libavformat/ffmetadec.c, from memory; the `ffmeta` package
 * notes it as FFmpeg bug 9144) treats a line break after any backslash as escaped, even an escaped
 * one, so a title ending in `\` would swallow the next line: such a title gets one trailing space.
 */
function escapeFfmetadataValue(text: string): string {
	if (!/[=;#\\\n]/.test(text)) return text;
	const escaped = text.replace(/[=;#\\\n]/g, '\\$&');
	return text.endsWith('\\') ? `${escaped} ` : escaped;
}

/** FFmpeg metadata file: `;FFMETADATA1`, then one `[CHAPTER]` per chapter in milliseconds. */
function toFfmetadata(chapters: TimedChapter[]): string {
	const sections = chapters.map(
		(chapter) =>
			// Without TIMEBASE FFmpeg reads START/END as nanoseconds, so it is always written.
			`[CHAPTER]\nTIMEBASE=1/1000\nSTART=${chapter.startMilliseconds}\nEND=${chapter.endMilliseconds}\ntitle=${escapeFfmetadataValue(chapter.title)}\n`
	);
	return `;FFMETADATA1\n${sections.join('')}`;
}

/** Podcasting 2.0 JSON chapters, version 1.2 (podcast namespace, docs/examples/chapters/jsonChapters.md). */
function toPodcastJson(chapters: TimedChapter[]): string {
	const document = {
		version: '1.2.0',
		chapters: chapters.map((chapter) => ({
			startTime: chapter.startMilliseconds / 1000,
			endTime: chapter.endMilliseconds / 1000,
			title: chapter.title,
			...(chapter.url ? { url: chapter.url } : {})
		}))
	};
	return `${JSON.stringify(document, null, 2)}\n`;
}

/** Seconds with exactly three decimals, written from whole milliseconds (no floating-point formatting). */
function secondsText(milliseconds: number): string {
	return `${Math.floor(milliseconds / 1000)}.${String(milliseconds % 1000).padStart(3, '0')}`;
}

/** CSV with a header row and CRLF line ends (RFC 4180); the timecode is at the episode's rate. */
function toCsv(chapters: TimedChapter[], options: ChapterExportOptions): string {
	const programme =
		options.programme ??
		programmeClock(
			programmeTimecode({ frameRate: options.rate, timecodeDropFrame: options.dropFrame })
		);
	const rows = [['start_timecode', 'start_seconds', 'end_seconds', 'title']];
	for (const chapter of chapters) {
		rows.push([
			programme.format(chapter.startFrame),
			secondsText(chapter.startMilliseconds),
			secondsText(chapter.endMilliseconds),
			chapter.title
		]);
	}
	return csvText(rows);
}

/** The chapter list in one format, with the content type and file extension to serve it with. */
export function exportChapters(
	format: ChapterFormat,
	chapters: Chapter[],
	options: ChapterExportOptions
): ChapterExport {
	const timed = timeChapters(chapters, options);
	switch (format) {
		case 'txt':
			return {
				body: toDescriptionText(timed, framesToMilliseconds(options.cutEndFrame, options.rate)),
				contentType: 'text/plain; charset=utf-8',
				extension: 'txt'
			};
		case 'vtt':
			return { body: toWebVtt(timed), contentType: 'text/vtt; charset=utf-8', extension: 'vtt' };
		case 'ffmetadata':
			return {
				body: toFfmetadata(timed),
				contentType: 'text/plain; charset=utf-8',
				extension: 'ffmeta'
			};
		case 'json':
			// The content type the Podcasting 2.0 JSON chapters spec names (jsonChapters.md, v1.2).
			return {
				body: toPodcastJson(timed),
				contentType: 'application/json+chapters',
				extension: 'json'
			};
		case 'csv':
			return {
				body: toCsv(timed, options),
				contentType: 'text/csv; charset=utf-8',
				extension: 'csv'
			};
		default: {
			const unknown: never = format;
			throw new ChapterExportError(
				`“${String(unknown)}” isn't an export format; pick one of ${CHAPTER_FORMATS.join(', ')}.`
			);
		}
	}
}
