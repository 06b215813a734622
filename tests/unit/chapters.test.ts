/**
 * Chapter rules and exports, checked against outside sources.
 *
 * Rules: common practice of video platforms for description chapters (from memory; their public
 * help pages state them): first at 0:00, at least three, ascending, each at least 10 s.
 * Exports are read back by independent parsers: `webvtt-parser` (the W3C validator's parser) for
 * WebVTT, `ffmeta` (modelled on FFmpeg's ffmetadec.c) and ffprobe where installed for FFmpeg
 * metadata, `papaparse` for RFC 4180 CSV, and the field rules of Podcasting 2.0 JSON chapters
 * (podcast namespace, docs/examples/chapters/jsonChapters.md, version 1.2) for JSON.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Papa from 'papaparse';
import { describe, expect, test } from 'vitest';
import {
	CHAPTER_FORMATS,
	ChapterExportError,
	exportChapters,
	sortChapters,
	validateChapters,
	type Chapter,
	type ChapterProblem
} from '$lib/chapters';
import type { FrameRate } from '$lib/timecode';

/** The part of webvtt-parser's result used here (node_modules/webvtt-parser/parser.js). */
interface WebVttTreeNode {
	type?: string;
	value?: string;
	children?: WebVttTreeNode[];
}
interface WebVttParseResult {
	cues: { startTime: number; endTime: number; text: string; tree: WebVttTreeNode }[];
	errors: { message: string; line: number }[];
}
interface WebVttParserConstructor {
	new (entities?: Record<string, string>): {
		parse(input: string, mode: 'chapters' | 'metadata'): WebVttParseResult;
	};
}
/** ffmeta's parse result (node_modules/ffmeta/dist/ffmeta.d.ts; its package exports don't expose the types). */
interface FfmetadataDocument {
	metadata: Record<string, string>;
	chapters: { TIMEBASE?: string; START: string; END: string; metadata: Record<string, string> }[];
}
interface SmpteTimecodeFactory {
	(frames: number, frameRate: [number, number], dropFrame: boolean): { toString(): string };
}

// The reference packages ship CommonJS without type declarations their exports map can reach.
const require = createRequire(import.meta.url);
const { parse: parseFfmetadata } = require('ffmeta') as {
	parse(source: string): FfmetadataDocument;
};
const { WebVTTParser } = require('webvtt-parser') as { WebVTTParser: WebVttParserConstructor };
// webvtt-parser's built-in entity table lacks the `;` forms and decodes `&amp;` as `&;`; its
// README says to pass html-entities.json for the spec's full character references.
const htmlEntities = require('webvtt-parser/html-entities.json') as Record<string, string>;
const referenceTimecode = require('smpte-timecode') as SmpteTimecodeFactory;

function parseWebVtt(text: string): WebVttParseResult {
	return new WebVTTParser(htmlEntities).parse(text, 'chapters');
}

/** The plain text of a parsed cue, after the parser has decoded character references. */
function cueText(node: WebVttTreeNode): string {
	if (node.type === 'text') return node.value ?? '';
	return (node.children ?? []).map(cueText).join('');
}

/** Whole milliseconds for a frame count at an exact rate num/den, rounded half up once (BigInt, exact). */
function exactMilliseconds(frames: number, numerator: number, denominator: number): number {
	const scaled = BigInt(frames) * BigInt(denominator) * 1000n;
	return Number((2n * scaled + BigInt(numerator)) / (2n * BigInt(numerator)));
}

/** 25 fps: frames = seconds × 25. */
const at25 = (seconds: number) => seconds * 25;

/** A sound list for a suspension lift episode at 25 fps, 10 minutes long. */
function liftEpisode(): Chapter[] {
	return [
		{ startFrame: 0, title: 'Cold open' },
		{ startFrame: at25(42), title: 'Pull the old leaf pack' },
		{ startFrame: at25(185), title: 'Set the new springs and shackles' },
		{ startFrame: at25(390), title: 'Torque the U-bolts' },
		{ startFrame: at25(520), title: 'Road test and re-torque' }
	];
}
const LIFT_CUT_END = at25(600);

function problemsAt(problems: ChapterProblem[], index: number | null): ChapterProblem[] {
	return problems.filter((problem) => problem.index === index);
}

describe('chapter rules (common practice of video platforms, from memory)', () => {
	test('a sound list has no problems', () => {
		expect(validateChapters(liftEpisode(), LIFT_CUT_END, '25')).toEqual([]);
	});

	test('a sound list at 29.97 with drop-frame positions has no problems', () => {
		const chapters: Chapter[] = [
			{ startFrame: 0, title: 'Cold open' },
			{ startFrame: 1800, title: 'Jack up the axle' },
			{ startFrame: 17982, title: 'Swap the shocks' }
		];
		expect(validateChapters(chapters, 107892, '29.97')).toEqual([]);
	});

	test('fewer than three chapters is a list problem', () => {
		const problems = validateChapters(liftEpisode().slice(0, 2), LIFT_CUT_END, '25');
		expect(problems).toEqual([
			{
				index: null,
				field: 'list',
				message: 'A chapter list needs at least 3 chapters; this one has 2.'
			}
		]);
		expect(validateChapters([], LIFT_CUT_END, '25')).toHaveLength(1);
	});

	test('the first chapter has to start at 0:00', () => {
		const chapters = liftEpisode();
		chapters[0] = { ...chapters[0], startFrame: at25(5) };
		expect(validateChapters(chapters, LIFT_CUT_END, '25')).toEqual([
			{
				index: 0,
				field: 'start',
				message: 'Chapter 1 “Cold open” starts at 0:05; the first chapter has to start at 0:00.'
			}
		]);
	});

	test('a first chapter a few frames late shows the milliseconds, not a misleading 0:00', () => {
		const chapters = liftEpisode();
		chapters[0] = { ...chapters[0], startFrame: 3 };
		const [problem] = validateChapters(chapters, LIFT_CUT_END, '25');
		expect(problem.message).toContain('starts at 0:00.120;');
	});

	test('each chapter has to start after the one before', () => {
		const chapters = liftEpisode();
		chapters[2] = { ...chapters[2], startFrame: at25(30) };
		const problems = validateChapters(chapters, LIFT_CUT_END, '25');
		expect(problemsAt(problems, 2)).toEqual([
			{
				index: 2,
				field: 'start',
				message:
					"Chapter 3 “Set the new springs and shackles” starts at 0:30, which isn't after chapter 2 “Pull the old leaf pack” (0:42); each chapter has to start after the one before."
			}
		]);
	});

	test('two chapters on the same frame are not strictly increasing', () => {
		const chapters = liftEpisode();
		chapters[3] = { ...chapters[3], startFrame: chapters[2].startFrame };
		const problems = validateChapters(chapters, LIFT_CUT_END, '25');
		expect(problemsAt(problems, 3).map((problem) => problem.message)).toEqual([
			expect.stringContaining(
				"Chapter 4 “Torque the U-bolts” starts at 3:05, which isn't after chapter 3"
			)
		]);
	});

	test('a chapter shorter than 10 s is named with its length', () => {
		const chapters: Chapter[] = [
			{ startFrame: 0, title: 'Cold open' },
			{ startFrame: at25(20), title: 'Pull the leaf pack' },
			{ startFrame: at25(26), title: 'Torque the U-bolts' }
		];
		expect(validateChapters(chapters, at25(120), '25')).toEqual([
			{
				index: 1,
				field: 'start',
				message: 'Chapter 2 “Pull the leaf pack” is 6 s long; chapters need at least 10 s.'
			}
		]);
	});

	test('the last chapter is measured to the end of the cut', () => {
		const chapters = liftEpisode();
		const problems = validateChapters(chapters, chapters[4].startFrame + at25(4), '25');
		expect(problems).toEqual([
			{
				index: 4,
				field: 'start',
				message:
					'Chapter 5 “Road test and re-torque” is 4 s long (it runs to the end of the cut); chapters need at least 10 s.'
			}
		]);
	});

	test('exactly 10 s passes and one frame less fails, measured at the exact rate', () => {
		// 29.97: 300 frames = 10.01 s (passes), 299 frames = 9.976 s (fails); 30000/1001 per
		// tests/REFERENCES.md, "Frame rates".
		const chapters = (secondLength: number): Chapter[] => [
			{ startFrame: 0, title: 'Cold open' },
			{ startFrame: 600, title: 'Break the U-bolts loose' },
			{ startFrame: 600 + secondLength, title: 'Drop the axle' }
		];
		expect(validateChapters(chapters(300), 5000, '29.97')).toEqual([]);
		const problems = validateChapters(chapters(299), 5000, '29.97');
		expect(problems.map((problem) => problem.message)).toEqual([
			'Chapter 2 “Break the U-bolts loose” is 9.9 s long; chapters need at least 10 s.'
		]);
		// 25 fps: exactly 250 frames = 10 s passes.
		const exact: Chapter[] = [
			{ startFrame: 0, title: 'Cold open' },
			{ startFrame: 250, title: 'Drop the axle' },
			{ startFrame: 500, title: 'Lift the axle' }
		];
		expect(validateChapters(exact, 750, '25')).toEqual([]);
	});

	test('a chapter at or past the end of the cut is refused', () => {
		const chapters = liftEpisode();
		const atEnd = validateChapters(chapters, chapters[4].startFrame, '25');
		expect(problemsAt(atEnd, 4)).toEqual([
			{
				index: 4,
				field: 'start',
				message:
					'Chapter 5 “Road test and re-torque” starts at 8:40, at or after the end of the cut (8:40); move it earlier or remove it.'
			}
		]);
		const pastEnd = validateChapters(chapters, at25(300), '25');
		expect(problemsAt(pastEnd, 3).map((problem) => problem.field)).toEqual(['start']);
		expect(problemsAt(pastEnd, 4).map((problem) => problem.field)).toEqual(['start']);
		// Chapter 3 now ends at the cut's end (5:00): 115 s, long enough.
		expect(problemsAt(pastEnd, 2)).toEqual([]);
	});

	test('a cut without a length is a list problem', () => {
		const problems = validateChapters(liftEpisode(), 0, '25');
		expect(problems.map((problem) => problem.field)).toContain('list');
		expect(problems[0].message).toContain('The cut has no length yet');
	});

	test('a start that is not a whole frame is refused', () => {
		const chapters = liftEpisode();
		chapters[1] = { ...chapters[1], startFrame: 12.5 };
		expect(problemsAt(validateChapters(chapters, LIFT_CUT_END, '25'), 1)).toEqual([
			{
				index: 1,
				field: 'start',
				message:
					'Chapter 2 “Pull the old leaf pack” has no usable start time; set it to a frame inside the cut.'
			}
		]);
	});

	test('a title that is empty after trimming is refused', () => {
		const chapters = liftEpisode();
		chapters[3] = { ...chapters[3], title: '  \n\t ' };
		expect(validateChapters(chapters, LIFT_CUT_END, '25')).toEqual([
			{
				index: 3,
				field: 'title',
				message: 'Chapter 4 has no title; give it a few words the viewer will see.'
			}
		]);
	});

	test('titles up to 100 characters pass, longer ones are refused, counting letters not bytes', () => {
		const chapters = liftEpisode();
		chapters[1] = { ...chapters[1], title: 'x'.repeat(100) };
		// 100 Japanese letters are 300 bytes of UTF-8 but 100 characters.
		chapters[2] = { ...chapters[2], title: '車'.repeat(100) };
		expect(validateChapters(chapters, LIFT_CUT_END, '25')).toEqual([]);
		chapters[3] = { ...chapters[3], title: `Torque the U-bolts ${'to spec '.repeat(12)}`.trim() };
		const problems = validateChapters(chapters, LIFT_CUT_END, '25');
		expect(problems).toHaveLength(1);
		expect(problems[0]).toMatchObject({ index: 3, field: 'title' });
		expect(problems[0].message).toBe(
			'Chapter 4 “Torque the U-bolts to spec to spec to…” has a 114-character title; keep it to 100 characters or fewer.'
		);
	});

	test('problems are reported per chapter, several at once', () => {
		const chapters: Chapter[] = [
			{ startFrame: at25(2), title: 'Cold open' },
			{ startFrame: at25(8), title: '' },
			{ startFrame: at25(100), title: 'Torque the U-bolts' },
			{ startFrame: at25(90), title: 'Road test' }
		];
		const problems = validateChapters(chapters, at25(95), '25');
		expect(problems.map(({ index, field }) => `${index}:${field}`)).toEqual([
			'0:start', // not at 0:00
			'0:start', // 6 s long
			'1:title', // no title (its length, 87 s to the cut's end, is fine)
			'2:start', // past the cut's end
			'3:start', // not after chapter 3
			'3:start' // 5 s to the cut's end
		]);
		expect(problems[1].message).toBe(
			'Chapter 1 “Cold open” is 6 s long; chapters need at least 10 s.'
		);
	});

	test('sortChapters orders by start without touching the original, keeping ties in order', () => {
		const chapters: Chapter[] = [
			{ startFrame: 500, title: 'Torque the U-bolts' },
			{ startFrame: 0, title: 'Cold open' },
			{ startFrame: 250, title: 'Pull the old leaf pack' },
			{ startFrame: 250, title: 'Second take of the pull' }
		];
		const sorted = sortChapters(chapters);
		expect(sorted.map((chapter) => chapter.title)).toEqual([
			'Cold open',
			'Pull the old leaf pack',
			'Second take of the pull',
			'Torque the U-bolts'
		]);
		expect(chapters[0].title).toBe('Torque the U-bolts');
	});
});

/** Titles that stress every format's escaping, with the title each format should read back. */
const TRICKY_TITLES: { title: string; oneLine: string; kept: string }[] = [
	{ title: 'Cold open', oneLine: 'Cold open', kept: 'Cold open' },
	{
		title: 'Pull the leaf pack, then "inspect" the hangers',
		oneLine: 'Pull the leaf pack, then "inspect" the hangers',
		kept: 'Pull the leaf pack, then "inspect" the hangers'
	},
	{
		title: 'Torque = 95 ft·lbf; step #3 \\ both sides',
		oneLine: 'Torque = 95 ft·lbf; step #3 \\ both sides',
		kept: 'Torque = 95 ft·lbf; step #3 \\ both sides'
	},
	{
		title: 'Bleed the brakes\nthen check the lines',
		oneLine: 'Bleed the brakes then check the lines',
		kept: 'Bleed the brakes\nthen check the lines'
	},
	{
		title: 'Old bump stops \r\n new bump stops',
		oneLine: 'Old bump stops new bump stops',
		kept: 'Old bump stops \n new bump stops'
	},
	{
		title: '<b>Bold</b> & shackle flip --> done',
		oneLine: '<b>Bold</b> & shackle flip --> done',
		kept: '<b>Bold</b> & shackle flip --> done'
	},
	{ title: 'リフトアップ完了', oneLine: 'リフトアップ完了', kept: 'リフトアップ完了' },
	{ title: 'Подвеска: проверка', oneLine: 'Подвеска: проверка', kept: 'Подвеска: проверка' },
	{
		title: 'Ανάρτηση και ευθυγράμμιση',
		oneLine: 'Ανάρτηση και ευθυγράμμιση',
		kept: 'Ανάρτηση και ευθυγράμμιση'
	}
];

/** Starts at 29.97 chosen to fall between milliseconds (1 frame = 33.366… ms). */
const TRICKY_STARTS = [0, 377, 1800, 5399, 9001, 12000, 17982, 20000, 24001];
const TRICKY_CUT_END = 30000;
const TRICKY_RATE: FrameRate = '29.97';

function trickyChapters(): Chapter[] {
	return TRICKY_TITLES.map(({ title }, index) => ({
		startFrame: TRICKY_STARTS[index],
		title,
		url: index === 1 ? 'https://example.com/parts/leaf-spring-hangers' : null
	}));
}

/**
 * Expected start and end milliseconds: exact rate 30000/1001 (tests/REFERENCES.md, "Frame rates"),
 * rounded once.
 */
function trickyTimes(): { start: number; end: number }[] {
	return TRICKY_STARTS.map((start, index) => ({
		start: exactMilliseconds(start, 30000, 1001),
		end: exactMilliseconds(TRICKY_STARTS[index + 1] ?? TRICKY_CUT_END, 30000, 1001)
	}));
}

const trickyOptions = { rate: TRICKY_RATE, cutEndFrame: TRICKY_CUT_END };

describe('description text export', () => {
	/** Reads `M:SS Title` / `H:MM:SS Title` lines as description timestamps are written (common practice). */
	function readDescription(body: string): { seconds: number; title: string; stamp: string }[] {
		return body
			.split('\n')
			.filter((line) => line !== '')
			.map((line) => {
				const match = /^(?:(\d+):)?(\d{1,2}):(\d{2}) (.+)$/.exec(line);
				if (!match) throw new Error(`not a description timestamp line: ${line}`);
				const [, hours = '0', minutes, seconds, title] = match;
				return {
					seconds: Number(hours) * 3600 + Number(minutes) * 60 + Number(seconds),
					title,
					stamp: line.slice(0, line.indexOf(' '))
				};
			});
	}

	test('lines read back with whole-second times (cut off) and one-line titles', () => {
		const exported = exportChapters('txt', trickyChapters(), trickyOptions);
		expect(exported.contentType).toBe('text/plain; charset=utf-8');
		expect(exported.extension).toBe('txt');
		const lines = readDescription(exported.body);
		expect(lines.map((line) => line.title)).toEqual(TRICKY_TITLES.map(({ oneLine }) => oneLine));
		expect(lines.map((line) => line.seconds)).toEqual(
			trickyTimes().map(({ start }) => Math.floor(start / 1000))
		);
		expect(lines[0].stamp).toBe('0:00');
		// Under an hour: M:SS on every line.
		expect(lines.every((line) => /^\d{1,2}:\d{2}$/.test(line.stamp))).toBe(true);
	});

	test('a cut of an hour or more writes H:MM:SS on every line', () => {
		// 1 hour at 25 fps = 90000 frames.
		const chapters = liftEpisode();
		const exported = exportChapters('txt', chapters, { rate: '25', cutEndFrame: 90000 });
		const lines = readDescription(exported.body);
		expect(lines.map((line) => line.stamp)).toEqual([
			'0:00:00',
			'0:00:42',
			'0:03:05',
			'0:06:30',
			'0:08:40'
		]);
		expect(
			exportChapters('txt', chapters, { rate: '25', cutEndFrame: 89999 }).body.split('\n')[0]
		).toBe('0:00 Cold open');
	});
});

describe('WebVTT export, read back by webvtt-parser (W3C WebVTT chapters)', () => {
	test('parses with zero errors, with cue times and titles equal to the chapters', () => {
		const exported = exportChapters('vtt', trickyChapters(), trickyOptions);
		expect(exported.contentType).toBe('text/vtt; charset=utf-8');
		expect(exported.extension).toBe('vtt');
		expect(exported.body.startsWith('WEBVTT\n\n')).toBe(true);
		const parsed = parseWebVtt(exported.body);
		expect(parsed.errors).toEqual([]);
		expect(parsed.cues).toHaveLength(TRICKY_TITLES.length);
		const times = trickyTimes();
		parsed.cues.forEach((cue, index) => {
			expect(Math.round(cue.startTime * 1000), `cue ${index} start`).toBe(times[index].start);
			expect(Math.round(cue.endTime * 1000), `cue ${index} end`).toBe(times[index].end);
			expect(cueText(cue.tree), `cue ${index} text`).toBe(TRICKY_TITLES[index].oneLine);
		});
		// Consecutive, non-overlapping chapter cues.
		for (let index = 1; index < parsed.cues.length; index++) {
			expect(parsed.cues[index].startTime).toBe(parsed.cues[index - 1].endTime);
		}
	});

	test('timings always carry two-digit hours and titles never contain -->', () => {
		const { body } = exportChapters('vtt', trickyChapters(), trickyOptions);
		const lines = body.split('\n');
		const timingLines = lines.filter((line) => line.includes('-->'));
		expect(timingLines).toHaveLength(TRICKY_TITLES.length);
		for (const line of timingLines) {
			expect(line).toMatch(/^\d{2}:\d{2}:\d{2}\.\d{3} --> \d{2}:\d{2}:\d{2}\.\d{3}$/);
		}
		expect(body).toContain('&lt;b&gt;Bold&lt;/b&gt; &amp; shackle flip --&gt; done');
	});
});

describe('FFmpeg metadata export', () => {
	test('ffmeta reads back TIMEBASE, START, END and every title', () => {
		const exported = exportChapters('ffmetadata', trickyChapters(), trickyOptions);
		expect(exported.contentType).toBe('text/plain; charset=utf-8');
		expect(exported.extension).toBe('ffmeta');
		expect(exported.body.startsWith(';FFMETADATA1\n')).toBe(true);
		const parsed = parseFfmetadata(exported.body);
		const times = trickyTimes();
		expect(parsed.chapters).toHaveLength(TRICKY_TITLES.length);
		parsed.chapters.forEach((chapter, index) => {
			expect(chapter.TIMEBASE).toBe('1/1000');
			expect(Number(chapter.START)).toBe(times[index].start);
			expect(Number(chapter.END)).toBe(times[index].end);
			expect(chapter.metadata.title).toBe(TRICKY_TITLES[index].kept);
		});
	});

	test('a title ending in a backslash gets one trailing space so it cannot swallow the next line', () => {
		// FFmpeg's reader treats a line break after any backslash as escaped (ffmeta notes FFmpeg bug 9144).
		const chapters: Chapter[] = [
			{ startFrame: 0, title: 'Cold open' },
			{ startFrame: 500, title: 'Path C:\\shop\\bay2\\' },
			{ startFrame: 1000, title: 'Torque the U-bolts' }
		];
		const parsed = parseFfmetadata(
			exportChapters('ffmetadata', chapters, { rate: '25', cutEndFrame: 2000 }).body
		);
		expect(parsed.chapters.map((chapter) => chapter.metadata.title)).toEqual([
			'Cold open',
			'Path C:\\shop\\bay2\\ ',
			'Torque the U-bolts'
		]);
	});

	test.skipIf(!existsSync('/usr/bin/ffprobe'))('ffprobe reads the chapters back', () => {
		const folder = mkdtempSync(join(tmpdir(), 'wrenchroll-chapters-'));
		try {
			const file = join(folder, 'chapters.ffmeta');
			writeFileSync(file, exportChapters('ffmetadata', trickyChapters(), trickyOptions).body);
			const output = execFileSync(
				'/usr/bin/ffprobe',
				['-v', 'error', '-f', 'ffmetadata', '-i', file, '-show_chapters', '-of', 'json'],
				{ encoding: 'utf8' }
			);
			const probed = JSON.parse(output) as {
				chapters: { start: number; end: number; time_base: string; tags?: { title?: string } }[];
			};
			const times = trickyTimes();
			expect(probed.chapters).toHaveLength(TRICKY_TITLES.length);
			probed.chapters.forEach((chapter, index) => {
				expect(chapter.time_base).toBe('1/1000');
				expect(chapter.start).toBe(times[index].start);
				expect(chapter.end).toBe(times[index].end);
				expect(chapter.tags?.title).toBe(TRICKY_TITLES[index].kept);
			});
		} finally {
			rmSync(folder, { recursive: true, force: true });
		}
	});
});

/**
 * The field rules of Podcasting 2.0 JSON chapters v1.2 (jsonChapters.md): `version` string and
 * `chapters` array required; each chapter needs a float `startTime`; `title`, `url` strings and
 * `endTime` float are optional; chapters ascend by `startTime`. Returns the rule broken, if any.
 */
function podcastChaptersProblem(document: unknown): string | null {
	if (typeof document !== 'object' || document === null) return 'not an object';
	const { version, chapters } = document as { version?: unknown; chapters?: unknown };
	if (typeof version !== 'string') return 'version is not a string';
	if (!Array.isArray(chapters)) return 'chapters is not an array';
	let previousStart = -Infinity;
	for (const chapter of chapters as Record<string, unknown>[]) {
		const { startTime, endTime, title, url } = chapter;
		if (typeof startTime !== 'number' || !Number.isFinite(startTime) || startTime < 0)
			return 'bad startTime';
		if (startTime < previousStart) return 'not ascending by startTime';
		previousStart = startTime;
		if (title !== undefined && typeof title !== 'string') return 'title is not a string';
		if (url !== undefined && typeof url !== 'string') return 'url is not a string';
		if (endTime !== undefined && (typeof endTime !== 'number' || endTime < startTime))
			return 'bad endTime';
	}
	return null;
}

describe('Podcasting 2.0 JSON chapters export', () => {
	test('follows the field rules, with times in seconds to the millisecond and titles kept', () => {
		const exported = exportChapters('json', trickyChapters(), trickyOptions);
		expect(exported.contentType).toBe('application/json+chapters');
		expect(exported.extension).toBe('json');
		const document = JSON.parse(exported.body) as {
			version: string;
			chapters: { startTime: number; endTime?: number; title?: string; url?: string }[];
		};
		expect(podcastChaptersProblem(document)).toBeNull();
		expect(document.version).toBe('1.2.0');
		const times = trickyTimes();
		expect(document.chapters.map((chapter) => chapter.startTime)).toEqual(
			times.map(({ start }) => start / 1000)
		);
		expect(document.chapters.map((chapter) => chapter.endTime)).toEqual(
			times.map(({ end }) => end / 1000)
		);
		expect(document.chapters.map((chapter) => chapter.title)).toEqual(
			TRICKY_TITLES.map(({ kept }) => kept)
		);
		expect(document.chapters[1].url).toBe('https://example.com/parts/leaf-spring-hangers');
		expect(document.chapters.filter((chapter) => 'url' in chapter)).toHaveLength(1);
	});

	test('the checker itself rejects documents that break the rules', () => {
		expect(podcastChaptersProblem({ chapters: [] })).toBe('version is not a string');
		expect(podcastChaptersProblem({ version: '1.2.0', chapters: [{ startTime: '0' }] })).toBe(
			'bad startTime'
		);
		expect(
			podcastChaptersProblem({ version: '1.2.0', chapters: [{ startTime: 5 }, { startTime: 1 }] })
		).toBe('not ascending by startTime');
	});

	test('a link that is not a web address is refused with a plain message', () => {
		const chapters = liftEpisode();
		chapters[2] = { ...chapters[2], url: 'javascript:alert(1)' };
		expect(() =>
			exportChapters('json', chapters, { rate: '25', cutEndFrame: LIFT_CUT_END })
		).toThrow(
			/Chapter 3 “Set the new springs and shackles” links to “javascript:alert\(1\)”, which isn't a web address/
		);
	});
});

describe('CSV export, read back by papaparse (RFC 4180)', () => {
	test('header, timecodes, seconds and quoted titles read back', () => {
		const exported = exportChapters('csv', trickyChapters(), trickyOptions);
		expect(exported.contentType).toBe('text/csv; charset=utf-8');
		expect(exported.extension).toBe('csv');
		const parsed = Papa.parse<Record<string, string>>(exported.body, {
			header: true,
			skipEmptyLines: true
		});
		expect(parsed.errors).toEqual([]);
		expect(parsed.meta.fields).toEqual(['start_timecode', 'start_seconds', 'end_seconds', 'title']);
		const times = trickyTimes();
		expect(parsed.data.map((row) => row.title)).toEqual(TRICKY_TITLES.map(({ kept }) => kept));
		expect(parsed.data.map((row) => Number(row.start_seconds))).toEqual(
			times.map(({ start }) => start / 1000)
		);
		expect(parsed.data.map((row) => Number(row.end_seconds))).toEqual(
			times.map(({ end }) => end / 1000)
		);
		// Start timecodes at 29.97 drop-frame, checked against smpte-timecode.
		expect(parsed.data.map((row) => row.start_timecode)).toEqual(
			TRICKY_STARTS.map((frame) => referenceTimecode(frame, [30000, 1001], true).toString())
		);
		expect(parsed.data[2].start_timecode).toBe('00:01:00;02');
	});

	test('non-drop timecode when asked, and rows end in CRLF', () => {
		const { body } = exportChapters('csv', trickyChapters(), {
			...trickyOptions,
			dropFrame: false
		});
		const parsed = Papa.parse<Record<string, string>>(body, { header: true, skipEmptyLines: true });
		expect(parsed.data[2].start_timecode).toBe('00:01:00:00');
		expect(body.startsWith('start_timecode,start_seconds,end_seconds,title\r\n')).toBe(true);
		expect(body.endsWith('\r\n')).toBe(true);
	});
});

describe('every format', () => {
	test('the list is exported in start order whatever order it is given in', () => {
		const shuffled = [...trickyChapters()].reverse();
		for (const format of CHAPTER_FORMATS) {
			expect(exportChapters(format, shuffled, trickyOptions).body, format).toBe(
				exportChapters(format, trickyChapters(), trickyOptions).body
			);
		}
	});

	test('lists that cannot be written are refused with plain messages', () => {
		const options = { rate: '25' as FrameRate, cutEndFrame: LIFT_CUT_END };
		const sameFrame = liftEpisode();
		sameFrame[2] = { ...sameFrame[2], startFrame: sameFrame[1].startFrame };
		const untitled = liftEpisode();
		untitled[1] = { ...untitled[1], title: '   ' };
		for (const format of CHAPTER_FORMATS) {
			expect(() => exportChapters(format, [], options)).toThrow(ChapterExportError);
			expect(() => exportChapters(format, sameFrame, options)).toThrow(/start on the same frame/);
			expect(() => exportChapters(format, untitled, options)).toThrow('Chapter 2 has no title');
			expect(() =>
				exportChapters(format, liftEpisode(), { rate: '25', cutEndFrame: at25(500) })
			).toThrow(/Chapter 5 “Road test and re-torque” starts at or after the end of the cut/);
		}
	});

	test('a 1,000-chapter list exports correctly in every format', () => {
		// 23.976: 300 frames = 12512.5 ms exactly, so half the starts are ties that round up once.
		const rate: FrameRate = '23.976';
		const alphabets = ['ボルト', 'болт', 'μπουλόνι', 'bolt, "snug"'];
		const chapters: Chapter[] = Array.from({ length: 1000 }, (_, index) => ({
			startFrame: index * 300,
			title: `Step ${index + 1}: ${alphabets[index % alphabets.length]} #${index}`
		}));
		const cutEndFrame = 1000 * 300;
		const options = { rate, cutEndFrame };
		const startMs = chapters.map(({ startFrame }) => exactMilliseconds(startFrame, 24000, 1001));
		const endMs = [...startMs.slice(1), exactMilliseconds(cutEndFrame, 24000, 1001)];
		expect(startMs[1]).toBe(12513);

		const vtt = parseWebVtt(exportChapters('vtt', chapters, options).body);
		expect(vtt.errors).toEqual([]);
		expect(vtt.cues.map((cue) => Math.round(cue.startTime * 1000))).toEqual(startMs);
		expect(vtt.cues.map((cue) => Math.round(cue.endTime * 1000))).toEqual(endMs);
		expect(vtt.cues.map((cue) => cueText(cue.tree))).toEqual(chapters.map(({ title }) => title));

		const ffmetadata = parseFfmetadata(exportChapters('ffmetadata', chapters, options).body);
		expect(ffmetadata.chapters.map((chapter) => Number(chapter.START))).toEqual(startMs);
		expect(ffmetadata.chapters.map((chapter) => Number(chapter.END))).toEqual(endMs);
		expect(ffmetadata.chapters.map((chapter) => chapter.metadata.title)).toEqual(
			chapters.map(({ title }) => title)
		);

		const json = JSON.parse(exportChapters('json', chapters, options).body) as {
			chapters: { startTime: number; title: string }[];
		};
		expect(podcastChaptersProblem(json)).toBeNull();
		expect(json.chapters.map((chapter) => Math.round(chapter.startTime * 1000))).toEqual(startMs);
		expect(json.chapters.map((chapter) => chapter.title)).toEqual(
			chapters.map(({ title }) => title)
		);

		const csv = Papa.parse<Record<string, string>>(exportChapters('csv', chapters, options).body, {
			header: true,
			skipEmptyLines: true
		});
		expect(csv.errors).toEqual([]);
		expect(csv.data.map((row) => row.title)).toEqual(chapters.map(({ title }) => title));
		expect(csv.data.map((row) => Math.round(Number(row.start_seconds) * 1000))).toEqual(startMs);
		expect(csv.data.map((row) => row.start_timecode)).toEqual(
			chapters.map(({ startFrame }) =>
				referenceTimecode(startFrame, [24000, 1001], false).toString()
			)
		);

		// Over an hour (1000 × 12.5 s ≈ 3.5 h): H:MM:SS on every line, seconds cut off.
		const txtLines = exportChapters('txt', chapters, options).body.trimEnd().split('\n');
		expect(txtLines).toHaveLength(1000);
		expect(txtLines.every((line) => /^\d+:\d{2}:\d{2} /.test(line))).toBe(true);
		expect(txtLines[999]).toBe(
			`${formatHms(Math.floor(startMs[999] / 1000))} ${chapters[999].title}`
		);
	});
});

/** H:MM:SS written out by hand for the check above. */
function formatHms(totalSeconds: number): string {
	const hours = Math.floor(totalSeconds / 3600);
	const minutes = Math.floor((totalSeconds % 3600) / 60);
	const seconds = totalSeconds % 60;
	return `${hours}:${String(minutes).padStart(2, '0')}:${String(seconds).padStart(2, '0')}`;
}
