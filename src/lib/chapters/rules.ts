/**
 * Chapter rules for an episode's chapter list, checked before the list goes into a video
 * description or an export.
 *
 * The rules are the common practice of video platforms for chapters written as timestamps in a
 * description (from memory; their public help pages state them): the first chapter starts at 0:00,
 * there are at least three, in ascending order, each at least 10 seconds long. Wrenchroll adds two
 * of its own: no chapter may start at or after the end of the cut, and titles are 1–100
 * characters once trimmed.
 *
 * Pure module: no I/O, safe in the browser and on the server.
 */

import { framesToMilliseconds, exactFps, formatMilliseconds, type FrameRate } from '../timecode';

/** One chapter marker; times are frame counts at the episode's frame rate. */
export interface Chapter {
	startFrame: number;
	title: string;
	url?: string | null;
}

/** One thing wrong with a chapter list; `index` is the chapter's position (0-based) or null for the whole list. */
export interface ChapterProblem {
	index: number | null;
	field: 'start' | 'title' | 'list';
	message: string;
}

export const MIN_CHAPTER_COUNT = 3;
export const MIN_CHAPTER_SECONDS = 10;
export const MAX_CHAPTER_TITLE_CHARACTERS = 100;

/** Longest title quoted inside a message before it is shortened with an ellipsis. */
const QUOTED_TITLE_CHARACTERS = 40;

/** A copy of the list ordered by start frame; chapters with the same start keep their order. */
export function sortChapters<T extends Chapter>(chapters: readonly T[]): T[] {
	return [...chapters].sort((a, b) => a.startFrame - b.startFrame);
}

/** Title length in Unicode code points, so a Japanese or Cyrillic letter counts as one character. */
export function titleLength(title: string): number {
	const trimmed = title.trim();
	// Without surrogate pairs every UTF-16 unit is one code point, so the length needs no copy.
	return /[\uD800-\uDFFF]/.test(trimmed) ? [...trimmed].length : trimmed.length;
}

/** A clock time for a message: `1:05`, or `1:05.040` when the frame doesn't fall on a whole second. */
function describeTime(frames: number, rate: FrameRate): string {
	const milliseconds = framesToMilliseconds(frames, rate);
	return formatMilliseconds(milliseconds, { millis: milliseconds % 1000 !== 0 });
}

/** `6 s` or `9.9 s`: cut off (not rounded) at tenths so a too-short chapter never reads as 10 s. */
function describeLength(frames: number, rate: FrameRate): string {
	const tenths = Math.floor(framesToMilliseconds(frames, rate) / 100);
	return tenths % 10 === 0 ? `${tenths / 10} s` : `${Math.floor(tenths / 10)}.${tenths % 10} s`;
}

/** `Chapter 2 “Pull the old leaf pack”`, or `Chapter 2 (no title)`; one-based like the crew counts. */
export function nameChapter(index: number, title: string): string {
	const oneLine = String(title ?? '')
		.replace(/\s+/g, ' ')
		.trim();
	if (oneLine === '') return `Chapter ${index + 1} (no title)`;
	const characters = [...oneLine];
	if (characters.length <= QUOTED_TITLE_CHARACTERS) return `Chapter ${index + 1} “${oneLine}”`;
	// Shorten at a word break when there is one near the cut, so the quote doesn't end mid-word.
	let shortened = characters.slice(0, QUOTED_TITLE_CHARACTERS - 1).join('');
	const lastSpace = shortened.lastIndexOf(' ');
	if (characters[QUOTED_TITLE_CHARACTERS - 1] !== ' ' && lastSpace >= QUOTED_TITLE_CHARACTERS / 2) {
		shortened = shortened.slice(0, lastSpace);
	}
	return `Chapter ${index + 1} “${shortened.trimEnd()}…”`;
}

function isUsableStart(startFrame: unknown): startFrame is number {
	return typeof startFrame === 'number' && Number.isSafeInteger(startFrame) && startFrame >= 0;
}

/** True when `lengthFrames` lasts at least 10 s at the exact rate (integer comparison, no rounding). */
function isLongEnough(lengthFrames: number, rate: FrameRate): boolean {
	const { numerator, denominator } = exactFps(rate);
	return lengthFrames * denominator >= MIN_CHAPTER_SECONDS * numerator;
}

/**
 * Every problem with a chapter list as given (not re-sorted), in plain crew words.
 * An empty array means the list is ready to paste into a description and to export.
 */
export function validateChapters(
	chapters: Chapter[],
	cutEndFrame: number,
	rate: FrameRate
): ChapterProblem[] {
	const problems: ChapterProblem[] = [];
	const cutIsSet = Number.isSafeInteger(cutEndFrame) && cutEndFrame > 0;

	if (!cutIsSet) {
		problems.push({
			index: null,
			field: 'list',
			message: 'The cut has no length yet; set where the cut ends before checking its chapters.'
		});
	}
	if (chapters.length < MIN_CHAPTER_COUNT) {
		problems.push({
			index: null,
			field: 'list',
			message: `A chapter list needs at least ${MIN_CHAPTER_COUNT} chapters; this one has ${chapters.length}.`
		});
	}

	chapters.forEach((chapter, index) => {
		// Named only when a message needs it: most chapters have no problem, and long lists are checked on every export.
		const name = () => nameChapter(index, chapter.title);
		const start = chapter.startFrame;

		if (!isUsableStart(start)) {
			problems.push({
				index,
				field: 'start',
				message: `${name()} has no usable start time; set it to a frame inside the cut.`
			});
		} else {
			const startsInsideCut = !cutIsSet || start < cutEndFrame;
			if (index === 0 && start !== 0) {
				problems.push({
					index,
					field: 'start',
					message: `${name()} starts at ${describeTime(start, rate)}; the first chapter has to start at 0:00.`
				});
			}
			const previous = index > 0 ? chapters[index - 1] : undefined;
			if (previous && isUsableStart(previous.startFrame) && start <= previous.startFrame) {
				problems.push({
					index,
					field: 'start',
					message: `${name()} starts at ${describeTime(start, rate)}, which isn't after ${nameChapter(index - 1, previous.title).replace(/^Chapter/, 'chapter')} (${describeTime(previous.startFrame, rate)}); each chapter has to start after the one before.`
				});
			}
			if (!startsInsideCut) {
				problems.push({
					index,
					field: 'start',
					message: `${name()} starts at ${describeTime(start, rate)}, at or after the end of the cut (${describeTime(cutEndFrame, rate)}); move it earlier or remove it.`
				});
			}
			if (cutIsSet && startsInsideCut) {
				const next = chapters[index + 1];
				const nextStart = next && isUsableStart(next.startFrame) ? next.startFrame : undefined;
				const isLast = next === undefined;
				// Where the next chapter is out of order that problem is reported on it; no length here.
				if (isLast || (nextStart !== undefined && nextStart > start)) {
					const end = Math.min(nextStart ?? cutEndFrame, cutEndFrame);
					const length = end - start;
					if (!isLongEnough(length, rate)) {
						const runsTo = isLast ? ' (it runs to the end of the cut)' : '';
						problems.push({
							index,
							field: 'start',
							message: `${name()} is ${describeLength(length, rate)} long${runsTo}; chapters need at least ${MIN_CHAPTER_SECONDS} s.`
						});
					}
				}
			}
		}

		const title = typeof chapter.title === 'string' ? chapter.title.trim() : '';
		if (title === '') {
			problems.push({
				index,
				field: 'title',
				message: `Chapter ${index + 1} has no title; give it a few words the viewer will see.`
			});
		} else if (titleLength(title) > MAX_CHAPTER_TITLE_CHARACTERS) {
			problems.push({
				index,
				field: 'title',
				message: `${name()} has a ${titleLength(title)}-character title; keep it to ${MAX_CHAPTER_TITLE_CHARACTERS} characters or fewer.`
			});
		}
	});

	return problems;
}
