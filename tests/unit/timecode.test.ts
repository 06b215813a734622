/**
 * Timecode arithmetic checked against outside sources.
 *
 * SMPTE ST 12-1 (formerly SMPTE 12M) defines drop-frame timecode, but its text is paywalled and
 * could not be read. The worked values below are the ones every implementation agrees on, and they
 * are checked against the independent implementations named beside each check: the npm package
 * `smpte-timecode` (MIT, run here as a reference) and FFmpeg's `libavutil/timecode.c` (from memory).
 */
import { createRequire } from 'node:module';
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import {
	FRAME_RATES,
	TimecodeError,
	defaultDropFrame,
	exactFps,
	formatClock,
	formatMilliseconds,
	formatTimecode,
	framesToMilliseconds,
	framesToSeconds,
	isDropFrameCapable,
	isFrameRate,
	nominalFps,
	parseTimecode,
	parseTimecodeInForm,
	secondsToFrames,
	type FrameRate
} from '$lib/timecode';

/** The part of smpte-timecode's API used here (node_modules/smpte-timecode/smpte-timecode.js). */
interface SmpteTimecode {
	frameCount: number;
	toString(): string;
}
type SmpteTimecodeFactory = (
	timecode: number | string,
	frameRate: [number, number],
	dropFrame: boolean
) => SmpteTimecode;

// smpte-timecode ships CommonJS without type declarations, so it is loaded through require.
const require = createRequire(import.meta.url);
const referenceTimecode = require('smpte-timecode') as SmpteTimecodeFactory;

/** Every (rate, drop-frame) pair Wrenchroll supports. */
const RATE_MODES: { rate: FrameRate; dropFrame: boolean }[] = FRAME_RATES.flatMap((rate) =>
	isDropFrameCapable(rate)
		? [
				{ rate, dropFrame: true },
				{ rate, dropFrame: false }
			]
		: [{ rate, dropFrame: false }]
);

/**
 * The drop-frame counting formula as the references state it (SMPTE ST 12-1;
 * tests/REFERENCES.md, "Timecode"): n = (3600h + 60m + s)·fps + f − D·(T − ⌊T/10⌋), T = 60h + m.
 */
function frameCountByFormula(
	hours: number,
	minutes: number,
	seconds: number,
	frames: number,
	fps: 30 | 60
): number {
	const dropped = fps === 30 ? 2 : 4;
	const totalMinutes = 60 * hours + minutes;
	return (
		(3600 * hours + 60 * minutes + seconds) * fps +
		frames -
		dropped * (totalMinutes - Math.floor(totalMinutes / 10))
	);
}

function timecodeErrorFor(action: () => unknown): TimecodeError {
	try {
		action();
	} catch (error) {
		expect(error).toBeInstanceOf(TimecodeError);
		return error as TimecodeError;
	}
	throw new Error('expected a TimecodeError, but nothing was thrown');
}

describe('frame rates', () => {
	test('lists the eight supported rates, drop-frame only at 29.97 and 59.94', () => {
		expect(FRAME_RATES).toEqual(['23.976', '24', '25', '29.97', '30', '50', '59.94', '60']);
		// SMPTE ST 12-1 (via smpte-timecode's README): drop-frame exists only at the 1000/1001 rates 29.97 and 59.94.
		expect(FRAME_RATES.filter(isDropFrameCapable)).toEqual(['29.97', '59.94']);
		expect(FRAME_RATES.filter(defaultDropFrame)).toEqual(['29.97', '59.94']);
		expect(isFrameRate('29.97')).toBe(true);
		expect(isFrameRate('29.976')).toBe(false);
	});

	test('nominal rates are the whole label counts per second', () => {
		expect(FRAME_RATES.map(nominalFps)).toEqual([24, 24, 25, 30, 30, 50, 60, 60]);
	});

	test('exact rates are the 1000/1001 fractions for the NTSC-family rates', () => {
		// tests/REFERENCES.md, "Frame rates": real time uses 24000/1001, 30000/1001, 60000/1001.
		expect(exactFps('23.976')).toEqual({ numerator: 24000, denominator: 1001 });
		expect(exactFps('29.97')).toEqual({ numerator: 30000, denominator: 1001 });
		expect(exactFps('59.94')).toEqual({ numerator: 60000, denominator: 1001 });
		expect(exactFps('25')).toEqual({ numerator: 25, denominator: 1 });
	});

	test('an unknown rate is refused with the list of known ones', () => {
		const error = timecodeErrorFor(() => nominalFps('48' as FrameRate));
		expect(error.message).toContain('“48”');
		expect(error.message).toContain('23.976, 24, 25, 29.97, 30, 50, 59.94, 60');
	});
});

describe('SMPTE ST 12-1 drop-frame worked values', () => {
	// Values from SMPTE ST 12-1 as restated in tests/REFERENCES.md, "Timecode"; cross-checked
	// against smpte-timecode below.
	test('29.97 DF: frame 1800 is 00:01:00;02 (labels ;00 and ;01 of minute 1 are skipped)', () => {
		expect(formatTimecode(1800, '29.97')).toBe('00:01:00;02');
		expect(parseTimecode('00:01:00;02', '29.97')).toBe(1800);
	});

	test('29.97 DF: frame 1799 is 00:00:59;29, the frame just before the skip', () => {
		expect(formatTimecode(1799, '29.97')).toBe('00:00:59;29');
		expect(parseTimecode('00:00:59;29', '29.97')).toBe(1799);
	});

	test('29.97 DF: frame 17982 is 00:10:00;00 (tenth minutes keep ;00)', () => {
		expect(formatTimecode(17982, '29.97')).toBe('00:10:00;00');
		expect(parseTimecode('00:10:00;00', '29.97')).toBe(17982);
		expect(formatTimecode(17981, '29.97')).toBe('00:09:59;29');
	});

	test('29.97 DF: one hour is 107892 frames, 108 labels fewer than 30 × 3600', () => {
		expect(parseTimecode('01:00:00;00', '29.97')).toBe(107892);
		expect(formatTimecode(107892, '29.97')).toBe('01:00:00;00');
		expect(30 * 3600 - parseTimecode('01:00:00;00', '29.97')).toBe(108);
	});

	test('59.94 DF: one hour is 215784 frames and ten minutes 35964', () => {
		expect(parseTimecode('01:00:00;00', '59.94')).toBe(215784);
		expect(parseTimecode('00:10:00;00', '59.94')).toBe(35964);
		expect(formatTimecode(215784, '59.94')).toBe('01:00:00;00');
		expect(formatTimecode(35964, '59.94')).toBe('00:10:00;00');
		// 59.94 skips ;00 to ;03: frame 3600 is the first label of minute 1.
		expect(formatTimecode(3600, '59.94')).toBe('00:01:00;04');
		expect(formatTimecode(3599, '59.94')).toBe('00:00:59;59');
	});

	test('parsing follows n = (3600h + 60m + s)·fps + f − D·(T − ⌊T/10⌋) across minutes and hours', () => {
		const labels: [number, number, number, number][] = [
			[0, 0, 0, 0],
			[0, 1, 0, 2],
			[0, 9, 59, 29],
			[0, 10, 0, 0],
			[0, 11, 0, 2],
			[1, 23, 45, 17],
			[9, 59, 59, 29],
			[23, 59, 59, 29]
		];
		for (const [h, m, s, f] of labels) {
			const text = `${[h, m, s].map((part) => String(part).padStart(2, '0')).join(':')};${String(f).padStart(2, '0')}`;
			expect(parseTimecode(text, '29.97'), text).toBe(frameCountByFormula(h, m, s, f, 30));
			// The same label shape at 59.94 (frame labels up to 59, D = 4).
			const f60 = Math.min(59, f * 2 + 4);
			const text60 = text.replace(/;\d\d$/, `;${String(f60).padStart(2, '0')}`);
			expect(parseTimecode(text60, '59.94'), text60).toBe(frameCountByFormula(h, m, s, f60, 60));
		}
	});

	test('a colon at 29.97 reads non-drop labels unless drop-frame is asked for (as smpte-timecode does)', () => {
		expect(parseTimecode('00:01:00:00', '29.97')).toBe(1800);
		expect(referenceTimecode('00:01:00:00', [30000, 1001], false).frameCount).toBe(1800);
		expect(parseTimecode('00:01:00:02', '29.97', { dropFrame: true })).toBe(1800);
		expect(formatTimecode(1800, '29.97', { dropFrame: false })).toBe('00:01:00:00');
	});
});

describe('real time at the exact rates', () => {
	test('107892 frames at 29.97 last 3599.9964 s', () => {
		// 107892 × 1001 / 30000 (tests/REFERENCES.md, "Frame rates": exact rate 30000/1001).
		expect(framesToSeconds(107892, '29.97')).toBe(3599.9964);
		expect(secondsToFrames(3599.9964, '29.97')).toBe(107892);
	});

	test('86400 frames at 23.976 last 3603.6 s', () => {
		expect(framesToSeconds(86400, '23.976')).toBe(3603.6);
		expect(secondsToFrames(3603.6, '23.976')).toBe(86400);
	});

	test('an hour of wall-clock time is the nearest frame, not the nominal count', () => {
		// 3600 s × 30000/1001 = 107892.107…, so the nearest frame is 107892 (not 108000).
		expect(secondsToFrames(3600, '29.97')).toBe(107892);
		// 3600 s × 24000/1001 = 86313.686…
		expect(secondsToFrames(3600, '23.976')).toBe(86314);
		expect(secondsToFrames(3600, '25')).toBe(90000);
	});

	test('milliseconds are rounded once from the exact value', () => {
		// 1 frame at 29.97 = 1001/30 ms = 33.3666… ms → 33; 2 frames → 66.733… → 67.
		expect(framesToMilliseconds(1, '29.97')).toBe(33);
		expect(framesToMilliseconds(2, '29.97')).toBe(67);
		// 300 frames at 23.976 = 12512.5 ms exactly: the half rounds up.
		expect(framesToMilliseconds(300, '23.976')).toBe(12513);
		expect(framesToMilliseconds(107892, '29.97')).toBe(3_599_996);
	});

	test('negative or non-numeric seconds are refused', () => {
		expect(timecodeErrorFor(() => secondsToFrames(-1, '25')).message).toContain('0 or more');
		expect(timecodeErrorFor(() => secondsToFrames(Number.NaN, '25')).message).toContain(
			'0 or more'
		);
	});
});

describe('round trips', () => {
	// Every frame of two hours at every rate and mode: format, parse back, and check labels only grow.
	for (const { rate, dropFrame } of RATE_MODES) {
		test(`every frame of 2 hours at ${rate} ${dropFrame ? 'DF' : 'NDF'} formats and parses back to itself`, () => {
			const { numerator, denominator } = exactFps(rate);
			const twoHours = Math.ceil((7200 * numerator) / denominator);
			let previous = '';
			let mismatches = 0;
			for (let frame = 0; frame <= twoHours; frame++) {
				const label = formatTimecode(frame, rate, { dropFrame });
				if (parseTimecode(label, rate, { dropFrame }) !== frame || label <= previous) mismatches++;
				previous = label;
			}
			expect(mismatches).toBe(0);
			expect(framesToSeconds(twoHours, rate)).toBeGreaterThanOrEqual(7200);
		});
	}

	test('hours keep counting past 24 instead of wrapping (a design choice; smpte-timecode wraps)', () => {
		expect(formatTimecode(24 * 3600 * 25, '25')).toBe('24:00:00:00');
		expect(parseTimecode('25:00:00:00', '25')).toBe(25 * 3600 * 25);
		expect(formatTimecode(24 * 107892, '29.97')).toBe('24:00:00;00');
		expect(formatTimecode(100 * 3600 * 24, '24')).toBe('100:00:00:00');
	});
});

describe('agreement with smpte-timecode (independent reference implementation)', () => {
	// smpte-timecode wraps at 24 h, so the random frame counts stay below one day.
	for (const { rate, dropFrame } of RATE_MODES) {
		const { numerator, denominator } = exactFps(rate);
		const mode = dropFrame ? 'DF' : 'NDF';
		const framesPerDay = dropFrame
			? 24 * parseTimecode('01:00:00;00', rate)
			: 24 * 3600 * nominalFps(rate);

		test(`formatted labels and parsed counts match at ${rate} ${mode}`, () => {
			fc.assert(
				fc.property(fc.integer({ min: 0, max: framesPerDay - 1 }), (frame) => {
					const reference = referenceTimecode(frame, [numerator, denominator], dropFrame);
					const label = formatTimecode(frame, rate, { dropFrame });
					expect(label).toBe(reference.toString());
					expect(parseTimecode(label, rate, { dropFrame })).toBe(
						referenceTimecode(label, [numerator, denominator], dropFrame).frameCount
					);
				}),
				{ numRuns: 400 }
			);
		});

		test(`any typed label is accepted or refused as smpte-timecode does at ${rate} ${mode}`, () => {
			const fps = nominalFps(rate);
			fc.assert(
				fc.property(
					fc.integer({ min: 0, max: 23 }),
					fc.integer({ min: 0, max: 59 }),
					// Bias towards the start of a minute, where drop-frame skips labels.
					fc.oneof(fc.constant(0), fc.integer({ min: 0, max: 59 })),
					fc.oneof(fc.integer({ min: 0, max: 4 }), fc.integer({ min: 0, max: fps - 1 })),
					(hours, minutes, seconds, frames) => {
						const label = `${[hours, minutes, seconds].map((part) => String(part).padStart(2, '0')).join(':')}${dropFrame ? ';' : ':'}${String(frames).padStart(2, '0')}`;
						let expected: number | 'refused';
						try {
							expected = referenceTimecode(label, [numerator, denominator], dropFrame).frameCount;
						} catch {
							expected = 'refused';
						}
						let actual: number | 'refused';
						try {
							actual = parseTimecode(label, rate, { dropFrame });
						} catch (error) {
							expect(error).toBeInstanceOf(TimecodeError);
							actual = 'refused';
						}
						expect(actual, label).toBe(expected);
					}
				),
				{ numRuns: 300 }
			);
		});
	}
});

describe('clock times', () => {
	test('M:SS, H:MM:SS and HH:MM:SS.mmm convert to the nearest frame at the exact rate', () => {
		expect(parseTimecode('1:30', '25')).toBe(2250);
		expect(parseTimecode('01:30', '25')).toBe(2250);
		expect(parseTimecode('1:00:00', '25')).toBe(90000);
		// 1.001 s × 30000/1001 = exactly 30 frames.
		expect(parseTimecode('0:00:01.001', '29.97')).toBe(30);
		// 3600 s × 30000/1001 = 107892.107… → 107892, not the nominal 108000.
		expect(parseTimecode('1:00:00.000', '29.97')).toBe(107892);
		// 0.5 s at 24 fps = 12 frames; a one-digit fraction is tenths.
		expect(parseTimecode('0:00.5', '24')).toBe(12);
		// 0:01.020 at 25 fps = 25.5 frames exactly: the half rounds up.
		expect(parseTimecode('0:01.020', '25')).toBe(26);
		expect(parseTimecode('  2:05  ', '60')).toBe(125 * 60);
	});

	test('formatClock shows M:SS under an hour and H:MM:SS from an hour on', () => {
		expect(formatClock(0)).toBe('0:00');
		expect(formatClock(65)).toBe('1:05');
		expect(formatClock(3599)).toBe('59:59');
		expect(formatClock(3600)).toBe('1:00:00');
		expect(formatClock(65, { hours: 'always' })).toBe('0:01:05');
		expect(formatClock(37230)).toBe('10:20:30');
	});

	test('with millis and hours always, hours are two digits (the WebVTT timestamp shape)', () => {
		// W3C WebVTT: hh:mm:ss.ttt, three-digit milliseconds.
		expect(formatClock(5, { hours: 'always', millis: true })).toBe('00:00:05.000');
		expect(formatClock(3725.5, { hours: 'always', millis: true })).toBe('01:02:05.500');
		expect(formatClock(65.25, { millis: true })).toBe('1:05.250');
	});

	test('rounding to milliseconds happens before splitting, so 60 seconds never shows', () => {
		expect(formatClock(59.9996, { millis: true })).toBe('1:00.000');
		expect(formatClock(59.9996)).toBe('1:00');
		expect(formatClock(3599.9999, { hours: 'always', millis: true })).toBe('01:00:00.000');
		expect(formatClock(59.9994, { millis: true })).toBe('0:59.999');
	});

	test('without millis, seconds are cut off so a timestamp never points past its moment', () => {
		expect(formatClock(59.9994)).toBe('0:59');
		expect(formatMilliseconds(12_999)).toBe('0:12');
	});

	test('negative clock times are refused', () => {
		expect(timecodeErrorFor(() => formatClock(-0.5)).message).toContain('0 or more');
	});
});

describe('error messages a person understands', () => {
	test('empty text asks for a timecode and shows the shapes', () => {
		const message = timecodeErrorFor(() => parseTimecode('   ', '25')).message;
		expect(message).toMatch(/^Type a timecode/);
		expect(message).toContain('HH:MM:SS:FF');
	});

	test('letters are pointed out', () => {
		expect(timecodeErrorFor(() => parseTimecode('1:3O', '25')).message).toContain(
			'has letters in it'
		);
		expect(timecodeErrorFor(() => parseTimecode('ten past', '25')).message).toContain('“ten past”');
	});

	test('a negative time is refused as negative', () => {
		expect(timecodeErrorFor(() => parseTimecode('-00:00:01:00', '25')).message).toContain(
			'is negative'
		);
		expect(timecodeErrorFor(() => parseTimecode('-0:05', '25')).message).toContain('is negative');
	});

	test('a frame number at or above the rate names the allowed range', () => {
		expect(timecodeErrorFor(() => parseTimecode('00:00:01:25', '25')).message).toBe(
			'“00:00:01:25” has frame 25, but at 25 fps the frames go from 00 to 24.'
		);
		expect(timecodeErrorFor(() => parseTimecode('00:00:01;30', '29.97')).message).toContain(
			'from 00 to 29'
		);
		expect(timecodeErrorFor(() => parseTimecode('00:00:01:24', '23.976')).message).toContain(
			'from 00 to 23'
		);
	});

	test('minutes or seconds of 60 or more are refused in timecodes and clock times', () => {
		expect(timecodeErrorFor(() => parseTimecode('00:60:00:00', '25')).message).toContain(
			'has 60 minutes'
		);
		expect(timecodeErrorFor(() => parseTimecode('00:00:75:00', '25')).message).toContain(
			'has 75 seconds'
		);
		expect(timecodeErrorFor(() => parseTimecode('1:60', '25')).message).toContain('has 60 seconds');
		expect(timecodeErrorFor(() => parseTimecode('75:00', '25')).message).toContain(
			'has 75 minutes'
		);
		expect(timecodeErrorFor(() => parseTimecode('1:61:00.000', '25')).message).toContain(
			'has 61 minutes'
		);
	});

	test('a dropped drop-frame label is named as missing, with the label to use instead', () => {
		// SMPTE ST 12-1 (via smpte-timecode, which also refuses it): 00:01:00;00 does not exist at 29.97 DF.
		expect(() => referenceTimecode('00:01:00;00', [30000, 1001], true)).toThrow();
		const message = timecodeErrorFor(() => parseTimecode('00:01:00;00', '29.97')).message;
		expect(message).toContain("doesn't exist in drop-frame");
		expect(message).toContain('Use 00:01:00;02');
		expect(timecodeErrorFor(() => parseTimecode('00:01:00;01', '29.97')).message).toContain(
			'Use 00:01:00;02'
		);
		expect(timecodeErrorFor(() => parseTimecode('00:07:00;03', '59.94')).message).toContain(
			'Use 00:07:00;04'
		);
		// Tenth minutes keep their ;00 label.
		expect(parseTimecode('00:20:00;00', '29.97')).toBe(frameCountByFormula(0, 20, 0, 0, 30));
	});

	test('a semicolon at a rate without drop-frame is explained, with the non-drop label', () => {
		expect(timecodeErrorFor(() => parseTimecode('00:01:00;00', '25')).message).toBe(
			'“00:01:00;00” is written as drop-frame (the “;” before the frames), but drop-frame only exists at 29.97 and 59.94 fps. At 25 fps write 00:01:00:00.'
		);
	});

	test('asking for drop-frame at a rate without it is refused', () => {
		expect(
			timecodeErrorFor(() => formatTimecode(100, '24', { dropFrame: true })).message
		).toContain('only exists at 29.97 and 59.94 fps');
		expect(
			timecodeErrorFor(() => parseTimecode('00:00:01:00', '60', { dropFrame: true })).message
		).toContain('only exists at 29.97 and 59.94 fps');
	});

	test('shapes that are neither a timecode nor a clock time are refused', () => {
		for (const text of ['1:5:00', '00:00:00:00:00', '12', '1.5', '00:00:00,000', ':30', '1:2']) {
			expect(timecodeErrorFor(() => parseTimecode(text, '25')).message, text).toContain(
				"isn't a timecode"
			);
		}
	});

	test('frame counts that are negative or fractional cannot be formatted', () => {
		expect(timecodeErrorFor(() => formatTimecode(-1, '25')).message).toContain('0 or more');
		expect(timecodeErrorFor(() => formatTimecode(1.5, '25')).message).toContain('whole number');
	});
});

describe('parseTimecodeInForm: timecode read in a take’s own form', () => {
	const ntsc: [number, number] = [30000, 1001];
	test('a drop-frame source reads ":" and ";" as the same drop-frame label', () => {
		// SMPTE ST 12-1 drop-frame counting, as computed by smpte-timecode.
		const expected = referenceTimecode('08:01:15;00', ntsc, true).frameCount;
		expect(parseTimecodeInForm('08:01:15;00', '29.97', true)).toBe(expected);
		expect(parseTimecodeInForm('08:01:15:00', '29.97', true)).toBe(expected);
	});

	test('a non-drop source reads ":" and ";" as the same non-drop label', () => {
		const expected = referenceTimecode('08:01:15:00', ntsc, false).frameCount;
		expect(parseTimecodeInForm('08:01:15:00', '29.97', false)).toBe(expected);
		expect(parseTimecodeInForm('08:01:15;00', '29.97', false)).toBe(expected);
		expect(parseTimecodeInForm('01:00:00;12', '25', false)).toBe(90012);
	});

	test('a label drop-frame skips is refused, naming the next frame', () => {
		// SMPTE ST 12-1: ;00 and ;01 are skipped at minute 02 (not a tenth minute).
		expect(() => parseTimecodeInForm('08:02:00:00', '29.97', true)).toThrow(/08:02:00;02/);
		expect(() => parseTimecodeInForm('08:02:00:00', '29.97', true)).toThrow(TimecodeError);
	});
});
