/**
 * Timecode and clock-time arithmetic for the frame rates the crew shoots and edits at.
 *
 * Pure module: no I/O, safe in the browser and on the server.
 *
 * Drop-frame follows SMPTE ST 12-1: at 29.97 fps the frame labels ;00 and ;01 are skipped at the
 * start of every minute except minutes 00, 10, 20, 30, 40 and 50; at 59.94 fps ;00 to ;03 are
 * skipped. The standard's text is paywalled, so the arithmetic is checked in the tests against
 * the independent implementations in the npm package `smpte-timecode` and FFmpeg's
 * `libavutil/timecode.c` (the latter from memory).
 *
 * Design choices:
 * - Positions are whole frame counts from the start of the cut (frame 0 = 00:00:00:00).
 * - Hours do not wrap at 24 h: frame counts past a day keep counting (24:00:00:00, 25:…). A cut
 *   is a duration, not a time of day, so wrapping would only hide mistakes.
 * - Real time uses the exact rational rates (24000/1001, 30000/1001, 60000/1001), never 29.97.
 */

/**
 * The most frames any time in Wrenchroll counts (a cut's length, a chapter, a take's timecode):
 * over 9,000 hours at 60 fps, far past any episode, and well inside a PostgreSQL `integer`.
 */
export const MAX_FRAMES = 2_000_000_000;

export const FRAME_RATES = Object.freeze([
	'23.976',
	'24',
	'25',
	'29.97',
	'30',
	'50',
	'59.94',
	'60'
] as const);

export type FrameRate = (typeof FRAME_RATES)[number];

/** A frame rate as an exact fraction of frames per second. */
export interface ExactFrameRate {
	numerator: number;
	denominator: number;
}

/** Thrown for timecode text or numbers a person should correct; the message says how. */
export class TimecodeError extends Error {
	constructor(message: string) {
		super(message);
		this.name = 'TimecodeError';
	}
}

interface RateFacts {
	nominal: number;
	numerator: number;
	denominator: number;
	/** Frame labels skipped at the start of each non-tenth minute in drop-frame; 0 when DF is not defined. */
	droppedPerMinute: number;
}

const RATE_FACTS: Record<FrameRate, RateFacts> = {
	'23.976': { nominal: 24, numerator: 24000, denominator: 1001, droppedPerMinute: 0 },
	'24': { nominal: 24, numerator: 24, denominator: 1, droppedPerMinute: 0 },
	'25': { nominal: 25, numerator: 25, denominator: 1, droppedPerMinute: 0 },
	'29.97': { nominal: 30, numerator: 30000, denominator: 1001, droppedPerMinute: 2 },
	'30': { nominal: 30, numerator: 30, denominator: 1, droppedPerMinute: 0 },
	'50': { nominal: 50, numerator: 50, denominator: 1, droppedPerMinute: 0 },
	'59.94': { nominal: 60, numerator: 60000, denominator: 1001, droppedPerMinute: 4 },
	'60': { nominal: 60, numerator: 60, denominator: 1, droppedPerMinute: 0 }
};

function factsFor(rate: FrameRate): RateFacts {
	// Rates arrive from forms and the database as plain strings, so check at run time too.
	const facts = Object.hasOwn(RATE_FACTS, rate) ? RATE_FACTS[rate] : undefined;
	if (!facts) {
		throw new TimecodeError(
			`“${String(rate)}” isn't a frame rate Wrenchroll knows. Pick one of ${FRAME_RATES.join(', ')} fps.`
		);
	}
	return facts;
}

/** True when `value` is one of the supported frame-rate labels. */
export function isFrameRate(value: unknown): value is FrameRate {
	return typeof value === 'string' && Object.hasOwn(RATE_FACTS, value);
}

/** True for the rates where SMPTE ST 12-1 defines drop-frame labels (29.97 and 59.94). */
export function isDropFrameCapable(rate: FrameRate): boolean {
	return factsFor(rate).droppedPerMinute > 0;
}

/** Whether timecode at this rate is written drop-frame unless told otherwise (common practice: yes at 29.97 and 59.94). */
export function defaultDropFrame(rate: FrameRate): boolean {
	return isDropFrameCapable(rate);
}

/** The whole number of frame labels per timecode second (24, 25, 30, 50, 60). */
export function nominalFps(rate: FrameRate): number {
	return factsFor(rate).nominal;
}

/** The exact frame rate as a fraction, e.g. 30000/1001 for 29.97. */
export function exactFps(rate: FrameRate): ExactFrameRate {
	const { numerator, denominator } = factsFor(rate);
	return { numerator, denominator };
}

/**
 * How a clip's measured rate (ffprobe's average, as stored: "29.97", "30", "119.88") sits with the
 * programme rate: the same rate; a whole multiple of it (overcranked for slow motion and conformed on
 * purpose, common practice); a different rate (plays at the wrong speed or drops and repeats frames
 * once cut in); or unknown (no rate was read). Labels carry three decimals, so a 0.01 fps tolerance.
 */
export function capturedRateFit(
	measured: string | null | undefined,
	programme: FrameRate
): 'same' | 'overcranked' | 'different' | 'unknown' {
	const fps = Number(measured);
	if (measured === null || measured === undefined || measured === '' || !(fps > 0))
		return 'unknown';
	const { numerator, denominator } = factsFor(programme);
	const exact = numerator / denominator;
	if (Math.abs(fps - exact) < 0.01) return 'same';
	const multiple = Math.round(fps / exact);
	return multiple >= 2 && Math.abs(fps - multiple * exact) < 0.01 * multiple
		? 'overcranked'
		: 'different';
}

function assertFrameCount(frames: number): void {
	if (!Number.isSafeInteger(frames) || frames < 0) {
		throw new TimecodeError(
			`${String(frames)} isn't a frame position: it has to be a whole number of frames, 0 or more.`
		);
	}
}

function resolveDropFrame(rate: FrameRate, dropFrame: boolean | undefined): boolean {
	const wanted = dropFrame ?? defaultDropFrame(rate);
	if (wanted && !isDropFrameCapable(rate)) {
		throw new TimecodeError(
			`Drop-frame timecode only exists at 29.97 and 59.94 fps, not at ${rate} fps.`
		);
	}
	return wanted;
}

/** Seconds of real time for a frame count: frames × denominator / numerator of the exact rate. */
export function framesToSeconds(frames: number, rate: FrameRate): number {
	const { numerator, denominator } = factsFor(rate);
	return (frames * denominator) / numerator;
}

/** Nearest frame to a real time in seconds, using the exact rational rate (halves round up). */
export function secondsToFrames(seconds: number, rate: FrameRate): number {
	if (!Number.isFinite(seconds) || seconds < 0) {
		throw new TimecodeError(
			`${String(seconds)} s isn't a time in the cut: it has to be 0 or more.`
		);
	}
	const { numerator, denominator } = factsFor(rate);
	return Math.round((seconds * numerator) / denominator);
}

/**
 * Whole milliseconds for a frame count, rounded once from the exact value frames × 1000 × den / num.
 * The product is an integer well inside 2^53, so the only rounding is the final one.
 */
export function framesToMilliseconds(frames: number, rate: FrameRate): number {
	const { numerator, denominator } = factsFor(rate);
	return Math.round((frames * denominator * 1000) / numerator);
}

/**
 * Frame count → drop-frame label counter (the count the labels would have without drops).
 * Same method as FFmpeg's av_timecode_adjust_ntsc_framenum2 (libavutil/timecode.c, from memory):
 * add back D labels per minute, minus the tenth minutes, for each complete block.
 */
function dropFrameLabelCount(frames: number, facts: RateFacts): number {
	const dropped = facts.droppedPerMinute;
	const framesPerTenMinutes = facts.nominal * 600 - 9 * dropped; // 17982 at 29.97, 35964 at 59.94
	const framesPerDroppedMinute = facts.nominal * 60 - dropped; // 1798 at 29.97, 3596 at 59.94
	const tenMinuteBlocks = Math.floor(frames / framesPerTenMinutes);
	const intoBlock = frames % framesPerTenMinutes;
	const droppedMinutesInBlock =
		intoBlock < dropped ? 0 : Math.floor((intoBlock - dropped) / framesPerDroppedMinute);
	return frames + 9 * dropped * tenMinuteBlocks + dropped * droppedMinutesInBlock;
}

const pad2 = (value: number): string => String(value).padStart(2, '0');

/** `HH:MM:SS:FF`, or `HH:MM:SS;FF` in drop-frame (default at 29.97 and 59.94); hours keep counting past 24. */
export function formatTimecode(
	frames: number,
	rate: FrameRate,
	opts: { dropFrame?: boolean } = {}
): string {
	const facts = factsFor(rate);
	assertFrameCount(frames);
	const dropFrame = resolveDropFrame(rate, opts.dropFrame);
	const labelCount = dropFrame ? dropFrameLabelCount(frames, facts) : frames;
	const fps = facts.nominal;
	const frameLabel = labelCount % fps;
	const totalSeconds = Math.floor(labelCount / fps);
	const seconds = totalSeconds % 60;
	const minutes = Math.floor(totalSeconds / 60) % 60;
	const hours = Math.floor(totalSeconds / 3600);
	return `${pad2(hours)}:${pad2(minutes)}:${pad2(seconds)}${dropFrame ? ';' : ':'}${pad2(frameLabel)}`;
}

const TIMECODE_PATTERN = /^(\d+):(\d{2}):(\d{2})([:;])(\d{2})$/;
// H:MM:SS needs two-digit minutes; M:SS takes any number of minute digits (still below 60).
const CLOCK_PATTERN = /^(?:(\d+):(\d{2})|(\d+)):(\d{2})(?:\.(\d+))?$/;
const EXAMPLES =
	'Write it as HH:MM:SS:FF (e.g. 00:04:30:12) or as a clock time like 4:30 or 0:04:30.500.';

function describeBadText(text: string): string {
	if (text === '') return `Type a timecode or a time. ${EXAMPLES}`;
	if (/^\s*[-−]/.test(text)) {
		return `“${text}” is negative; times in a cut start at 00:00:00:00 and count up.`;
	}
	if (/\p{L}/u.test(text)) {
		return `“${text}” has letters in it; use only digits and separators. ${EXAMPLES}`;
	}
	return `“${text}” isn't a timecode or a clock time Wrenchroll can read. ${EXAMPLES}`;
}

function checkMinutesAndSeconds(text: string, minutes: number, seconds: number): void {
	if (minutes >= 60) {
		throw new TimecodeError(
			`“${text}” has ${minutes} minutes; minutes go from 00 to 59 (carry the rest into hours).`
		);
	}
	if (seconds >= 60) {
		throw new TimecodeError(
			`“${text}” has ${seconds} seconds; seconds go from 00 to 59 (carry the rest into minutes).`
		);
	}
}

const tooLong = (text: string) =>
	`“${text}” is far too long a time: check the hours (no cut runs anywhere near that long).`;

/** Nearest integer to numerator/denominator for non-negative BigInts, halves rounding up. */
function roundRatio(numerator: bigint, denominator: bigint): bigint {
	return (2n * numerator + denominator) / (2n * denominator);
}

function parseClockTime(text: string, match: RegExpExecArray, facts: RateFacts): number {
	const [, hoursText, minutesAfterHours, minutesAlone, secondsText, fractionText = ''] = match;
	const hours = hoursText === undefined ? 0 : Number(hoursText);
	const minutes = Number(minutesAfterHours ?? minutesAlone);
	const seconds = Number(secondsText);
	checkMinutesAndSeconds(text, minutes, seconds);
	// Exact rational arithmetic: whole seconds plus a decimal fraction, times num/den, rounded once.
	const scale = 10n ** BigInt(fractionText.length);
	const scaledSeconds =
		(BigInt(hours) * 3600n + BigInt(minutes) * 60n + BigInt(seconds)) * scale +
		BigInt(fractionText === '' ? 0 : fractionText);
	const frames = roundRatio(
		scaledSeconds * BigInt(facts.numerator),
		scale * BigInt(facts.denominator)
	);
	const result = Number(frames);
	if (!Number.isSafeInteger(result) || result > MAX_FRAMES) throw new TimecodeError(tooLong(text));
	return result;
}

/**
 * Frame count for `HH:MM:SS:FF`, `HH:MM:SS;FF` (the semicolon means drop-frame) or a clock time
 * `M:SS`, `H:MM:SS`, `HH:MM:SS.mmm` (nearest frame at the exact rate).
 * Drop-frame count per SMPTE ST 12-1: n = (3600h + 60m + s)·fps + f − D·(T − ⌊T/10⌋), T = 60h + m.
 * A `;` always means drop-frame; with `:` the labels are read as non-drop unless `dropFrame: true`.
 */
export function parseTimecode(
	text: string,
	rate: FrameRate,
	opts: { dropFrame?: boolean } = {}
): number {
	const facts = factsFor(rate);
	const trimmed = String(text ?? '').trim();

	const timecode = TIMECODE_PATTERN.exec(trimmed);
	if (timecode) {
		const [, hoursText, minutesText, secondsText, separator, framesText] = timecode;
		const hours = Number(hoursText);
		const minutes = Number(minutesText);
		const seconds = Number(secondsText);
		const frameLabel = Number(framesText);
		const semicolon = separator === ';';
		if (semicolon && !isDropFrameCapable(rate)) {
			throw new TimecodeError(
				`“${trimmed}” is written as drop-frame (the “;” before the frames), but drop-frame only exists at 29.97 and 59.94 fps. At ${rate} fps write ${hoursText}:${minutesText}:${secondsText}:${framesText}.`
			);
		}
		const dropFrame = semicolon || resolveDropFrame(rate, opts.dropFrame ?? false);
		checkMinutesAndSeconds(trimmed, minutes, seconds);
		if (frameLabel >= facts.nominal) {
			throw new TimecodeError(
				`“${trimmed}” has frame ${framesText}, but at ${rate} fps the frames go from 00 to ${pad2(facts.nominal - 1)}.`
			);
		}
		const dropped = dropFrame ? facts.droppedPerMinute : 0;
		const totalMinutes = 60 * hours + minutes;
		if (dropped > 0 && seconds === 0 && minutes % 10 !== 0 && frameLabel < dropped) {
			const skippedLabels = dropped === 2 ? ';00 and ;01' : `;00 to ;${pad2(dropped - 1)}`;
			const nextLabel = `${hoursText}:${minutesText}:00;${pad2(dropped)}`;
			throw new TimecodeError(
				`“${trimmed}” doesn't exist in drop-frame timecode: at ${rate} fps the labels ${skippedLabels} are skipped at the start of every minute except each tenth minute. Use ${nextLabel}, the next frame.`
			);
		}
		const frames =
			(3600 * hours + 60 * minutes + seconds) * facts.nominal +
			frameLabel -
			dropped * (totalMinutes - Math.floor(totalMinutes / 10));
		if (!Number.isSafeInteger(frames) || frames > MAX_FRAMES)
			throw new TimecodeError(tooLong(trimmed));
		return frames;
	}

	const clock = CLOCK_PATTERN.exec(trimmed);
	if (clock) return parseClockTime(trimmed, clock, facts);

	throw new TimecodeError(describeBadText(trimmed));
}

/**
 * Frame count for time a person types on a page: timecode or clock text, read the way the pages
 * show it (drop-frame at 29.97 and 59.94, so `00:10:00:00` there means `00:10:00;00`).
 */
export function parseTypedTime(text: string, rate: FrameRate): number {
	return parseTimecode(text, rate, { dropFrame: defaultDropFrame(rate) });
}

/** A read of typed time: the frame, or the typing mistake in plain words and the field it was typed in. */
export type TypedTime = { ok: true; frame: number } | { ok: false; field: string; message: string };

/**
 * Runs a read of typed time (parseTypedTime, chapterStartFromText, …). A TimecodeError is a typing
 * mistake the person can correct, so it comes back tied to `field`; any other failure is a bug and
 * is thrown on.
 */
export function readTypedTime(field: string, read: () => number): TypedTime {
	try {
		return { ok: true, frame: read() };
	} catch (failure) {
		if (failure instanceof TimecodeError) return { ok: false, field, message: failure.message };
		throw failure;
	}
}

/**
 * Frame count for timecode typed against a source of known form (a take logged drop-frame or
 * not): the labels are read in that form whichever of ':' or ';' separates the frames, since the
 * digits mean one frame either way; clock times read as in {@link parseTimecode}.
 */
export function parseTimecodeInForm(text: string, rate: FrameRate, dropFrame: boolean): number {
	const trimmed = String(text ?? '').trim();
	const timecode = TIMECODE_PATTERN.exec(trimmed);
	if (timecode && !dropFrame && timecode[4] === ';') {
		return parseTimecode(trimmed.replace(/;(\d{2})$/, ':$1'), rate, { dropFrame: false });
	}
	return parseTimecode(trimmed, rate, { dropFrame: dropFrame && isDropFrameCapable(rate) });
}

/**
 * Clock time `M:SS`, `H:MM:SS`, or with millis `M:SS.mmm` / `HH:MM:SS.mmm` (two-digit hours when
 * hours are 'always'). Rounds to whole milliseconds first and then splits, so 59.9996 s shows as
 * 1:00.000, never 0:60.000. Without millis the seconds are cut off, not rounded, so a timestamp
 * pasted into a description never lands after the moment it names.
 */
export function formatClock(
	seconds: number,
	opts: { hours?: 'auto' | 'always'; millis?: boolean } = {}
): string {
	if (!Number.isFinite(seconds) || seconds < 0) {
		throw new TimecodeError(
			`${String(seconds)} s isn't a time in the cut: it has to be 0 or more.`
		);
	}
	return formatMilliseconds(Math.round(seconds * 1000), opts);
}

/** Clock time for whole milliseconds; same layout as formatClock, without a second rounding. */
export function formatMilliseconds(
	milliseconds: number,
	opts: { hours?: 'auto' | 'always'; millis?: boolean } = {}
): string {
	if (!Number.isSafeInteger(milliseconds) || milliseconds < 0) {
		throw new TimecodeError(
			`${String(milliseconds)} ms isn't a time in the cut: it has to be a whole number, 0 or more.`
		);
	}
	const showHours = opts.hours ?? 'auto';
	const millis = milliseconds % 1000;
	const totalSeconds = Math.floor(milliseconds / 1000);
	const secondsPart = totalSeconds % 60;
	const minutes = Math.floor(totalSeconds / 60) % 60;
	const hours = Math.floor(totalSeconds / 3600);
	const fraction = opts.millis ? `.${String(millis).padStart(3, '0')}` : '';
	if (hours > 0 || showHours === 'always') {
		const hoursText = opts.millis && showHours === 'always' ? pad2(hours) : String(hours);
		return `${hoursText}:${pad2(minutes)}:${pad2(secondsPart)}${fraction}`;
	}
	return `${minutes}:${pad2(secondsPart)}${fraction}`;
}

/** The label of a cut's first frame unless an episode says otherwise. */
export const DEFAULT_TIMECODE_START = '00:00:00:00';

/**
 * How an episode labels positions in its cut (its programme timecode): the rate, drop-frame or
 * non-drop, and the label its first frame carries (many edit systems start a sequence at
 * 01:00:00:00, common practice). Plain data, so a load can hand it to a page.
 */
export interface ProgrammeTimecode {
	frameRate: FrameRate;
	dropFrame: boolean;
	/** The first frame's label, written `HH:MM:SS:FF` with a colon whatever the form. */
	start: string;
}

/**
 * An episode's programme timecode from its stored setting: a drop-frame flag of null means the
 * rate's usual form (drop-frame at 29.97 and 59.94), and no start means 00:00:00:00.
 */
export function programmeTimecode(episode: {
	frameRate: FrameRate;
	timecodeDropFrame?: boolean | null;
	timecodeStart?: string | null;
}): ProgrammeTimecode {
	const dropFrame = episode.timecodeDropFrame ?? defaultDropFrame(episode.frameRate);
	return {
		frameRate: episode.frameRate,
		dropFrame: dropFrame && isDropFrameCapable(episode.frameRate),
		start: episode.timecodeStart || DEFAULT_TIMECODE_START
	};
}

/**
 * Reads and writes an episode's programme time. Positions stay frame counts from the start of the
 * cut (frame 0); only their labels carry the start offset. Typed timecode names a label, so the
 * offset is taken off; a clock time (4:30, 0:04:30.500) counts real time from the start of the cut,
 * as published chapters do, so it is read without the offset.
 */
export interface ProgrammeClock {
	readonly timecode: ProgrammeTimecode;
	readonly rate: FrameRate;
	readonly dropFrame: boolean;
	/** The absolute label count of the cut's first frame (108000 for 01:00:00:00 at 29.97 non-drop). */
	readonly startFrame: number;
	/** The first frame's label in this form, e.g. `01:00:00;00` in drop-frame. */
	readonly startLabel: string;
	/** The label a position in the cut carries (its frame count plus the start). */
	format(position: number): string;
	/** A length (a cut's, a segment's) as timecode in this form, without the start. */
	formatLength(frames: number): string;
	/** The position typed timecode or clock text names; a label before the start is a TimecodeError. */
	parse(text: string): number;
	/** A length typed as timecode or clock text, read in this form, without the start. */
	parseLength(text: string): number;
	/**
	 * A placeholder or hint: the label as far into the cut as `length` (written `HH:MM:SS:FF`) says,
	 * in this form and with the start, e.g. `01:04:07:12` for `00:04:07:12` from 01:00:00:00.
	 */
	example(length: string): string;
}

/**
 * Reads a start label (`01:00:00:00`) at a rate and form: its absolute label count. Throws a
 * TimecodeError in plain words when the label can't be a start (a clock time, a skipped
 * drop-frame label, frames past the rate).
 */
export function timecodeStartFrame(start: string, rate: FrameRate, dropFrame: boolean): number {
	const trimmed = String(start ?? '').trim();
	if (!TIMECODE_PATTERN.exec(trimmed)) {
		throw new TimecodeError(
			`“${trimmed}” isn't a start timecode: write it as HH:MM:SS:FF, e.g. 01:00:00:00 (or 00:00:00:00 for none).`
		);
	}
	const frames = parseTimecodeInForm(trimmed, rate, dropFrame && isDropFrameCapable(rate));
	if (frames >= 24 * 3600 * nominalFps(rate)) {
		throw new TimecodeError(
			`“${trimmed}” is past a day: a start timecode runs from 00:00:00:00 to 23:59:59, e.g. 01:00:00:00.`
		);
	}
	return frames;
}

/** The one reader and writer of an episode's programme time; every page and export goes through it. */
export function programmeClock(timecode: ProgrammeTimecode): ProgrammeClock {
	const rate = timecode.frameRate;
	const dropFrame = timecode.dropFrame && isDropFrameCapable(rate);
	const startFrame = timecodeStartFrame(timecode.start, rate, dropFrame);
	const label = (frames: number) => formatTimecode(frames, rate, { dropFrame });
	const startLabel = label(startFrame);

	function readLabel(text: string): number {
		const trimmed = String(text ?? '').trim();
		const match = TIMECODE_PATTERN.exec(trimmed);
		if (match && match[4] === ';' && !dropFrame && isDropFrameCapable(rate)) {
			throw new TimecodeError(
				`“${trimmed}” is written as drop-frame (the “;” before the frames), but this episode's programme timecode is non-drop. Write ${trimmed.replace(/;(\d{2})$/, ':$1')}, or set drop-frame in the episode's details.`
			);
		}
		return parseTimecode(trimmed, rate, { dropFrame });
	}

	return {
		timecode: { frameRate: rate, dropFrame, start: timecode.start },
		rate,
		dropFrame,
		startFrame,
		startLabel,
		format: (position) => {
			assertFrameCount(position);
			return label(position + startFrame);
		},
		formatLength: (frames) => label(frames),
		parse(text) {
			const trimmed = String(text ?? '').trim();
			const frames = readLabel(trimmed);
			if (!TIMECODE_PATTERN.test(trimmed) || startFrame === 0) return frames;
			if (frames < startFrame) {
				throw new TimecodeError(
					`“${trimmed}” is before the start of this cut's timecode (${startLabel}): its first frame is ${startLabel}, so type ${label(startFrame)} or later, or a clock time such as 4:30 counted from the start of the cut.`
				);
			}
			return frames - startFrame;
		},
		parseLength: (text) => readLabel(text),
		example: (length) => label(startFrame + parseTimecodeInForm(length, rate, dropFrame))
	};
}

/** A programme clock as given, or the usual one for a bare rate (its usual form from 00:00:00:00). */
export function clockOrUsual(clockOrRate: ProgrammeClock | FrameRate): ProgrammeClock {
	return typeof clockOrRate === 'string'
		? programmeClock(programmeTimecode({ frameRate: clockOrRate }))
		: clockOrRate;
}

/** The programme clock of a page's episode heading (rate, drop-frame flag and start label). */
export function clockOfHeading(episode: {
	frameRate: FrameRate;
	dropFrame: boolean;
	timecodeStart: string;
}): ProgrammeClock {
	return programmeClock({
		frameRate: episode.frameRate,
		dropFrame: episode.dropFrame,
		start: episode.timecodeStart
	});
}
