/**
 * An episode's programme timecode (programmeClock): drop-frame or non-drop and a start offset,
 * checked against outside sources.
 *
 * Drop-frame labels follow SMPTE ST 12-1 as restated in tests/REFERENCES.md, "Timecode" (the
 * standard is paywalled); every count is cross-checked with the npm package `smpte-timecode`, run
 * here as a second opinion. A sequence starting at 01:00:00:00 is common practice in edit systems
 * (tests/REFERENCES.md, "Timecode", "Start offsets").
 */
import { createRequire } from 'node:module';
import { describe, expect, test } from 'vitest';
import {
	TimecodeError,
	programmeClock,
	programmeTimecode,
	readTypedTime,
	type FrameRate
} from '$lib/timecode';
import { chapterStartFromText } from '$lib/chapters';

/** The part of smpte-timecode's API used here (node_modules/smpte-timecode/smpte-timecode.js). */
interface SmpteTimecode {
	frameCount: number;
	add(frames: number): SmpteTimecode;
	toString(): string;
}
type SmpteTimecodeFactory = (
	timecode: number | string,
	frameRate: [number, number],
	dropFrame: boolean
) => SmpteTimecode;

// smpte-timecode ships CommonJS without type declarations, so it is loaded through require.
const referenceTimecode = createRequire(import.meta.url)('smpte-timecode') as SmpteTimecodeFactory;

const EXACT: Partial<Record<FrameRate, [number, number]>> = {
	'29.97': [30000, 1001],
	'59.94': [60000, 1001]
};

const clockOf = (frameRate: FrameRate, dropFrame: boolean, start = '01:00:00:00') =>
	programmeClock({ frameRate, dropFrame, start });

describe('the start offset 01:00:00:00 at 29.97 and 59.94, non-drop and drop-frame', () => {
	test('non-drop 01:00:00:00 at 29.97 is label count 108000; drop-frame is 107892', () => {
		// SMPTE ST 12-1 via tests/REFERENCES.md, "Timecode": an hour of non-drop labels is
		// 3600 × 30 = 108000; drop-frame skips 108 labels an hour, 107892.
		expect(clockOf('29.97', false).startFrame).toBe(108000);
		expect(referenceTimecode('01:00:00:00', [30000, 1001], false).frameCount).toBe(108000);
		expect(clockOf('29.97', true).startFrame).toBe(107892);
		expect(referenceTimecode('01:00:00;00', [30000, 1001], true).frameCount).toBe(107892);
	});

	test('non-drop 01:00:00:00 at 59.94 is label count 216000; drop-frame is 215784', () => {
		// tests/REFERENCES.md, "Timecode": 59.94 drop-frame holds 215784 frames an hour.
		expect(clockOf('59.94', false).startFrame).toBe(216000);
		expect(referenceTimecode('01:00:00:00', [60000, 1001], false).frameCount).toBe(216000);
		expect(clockOf('59.94', true).startFrame).toBe(215784);
		expect(referenceTimecode('01:00:00;00', [60000, 1001], true).frameCount).toBe(215784);
	});

	test('the start label is shown in the episode’s form', () => {
		// SMPTE ST 12-1 (tests/REFERENCES.md, "Timecode"): ';' before the frames marks drop-frame.
		expect(clockOf('29.97', false).startLabel).toBe('01:00:00:00');
		expect(clockOf('29.97', true).startLabel).toBe('01:00:00;00');
	});

	for (const rate of ['29.97', '59.94'] as const) {
		for (const dropFrame of [false, true]) {
			const form = dropFrame ? 'drop-frame' : 'non-drop';
			test(`at ${rate} ${form}, positions show as the start plus the frame count, as smpte-timecode adds them`, () => {
				const clock = clockOf(rate, dropFrame);
				const start = dropFrame ? '01:00:00;00' : '01:00:00:00';
				for (const position of [0, 1, 1799, 1800, 17982, 18000, 107892, 108000, 123456]) {
					// smpte-timecode: the start label plus `position` frames, in the same form.
					const expected = referenceTimecode(start, EXACT[rate]!, dropFrame)
						.add(position)
						.toString();
					expect(clock.format(position)).toBe(expected);
					expect(clock.parse(expected)).toBe(position);
				}
			});
		}
	}

	test('at 29.97 non-drop, 01:01:00:00 typed is 1800 frames into the cut; in drop-frame 01:01:00;02 is', () => {
		// tests/REFERENCES.md, "Timecode": the label after 00:00:59;29 is 00:01:00;02 (frame 1800),
		// so one minute past a 01:00:00;00 start is 01:01:00;02; smpte-timecode agrees.
		expect(clockOf('29.97', false).parse('01:01:00:00')).toBe(1800);
		expect(clockOf('29.97', true).parse('01:01:00;02')).toBe(1800);
		expect(
			referenceTimecode('01:01:00;02', [30000, 1001], true).frameCount -
				referenceTimecode('01:00:00;00', [30000, 1001], true).frameCount
		).toBe(1800);
	});

	test('ten minutes past 01:00:00:00 differ by 18 frames between the two forms at 29.97', () => {
		// tests/REFERENCES.md, "Timecode": ten drop-frame minutes hold 17982 frames, non-drop 18000.
		expect(clockOf('29.97', false).parse('01:10:00:00')).toBe(18000);
		expect(clockOf('29.97', true).parse('01:10:00;00')).toBe(17982);
		// The same label typed with ':' on a drop-frame timeline still reads as drop-frame.
		expect(clockOf('29.97', true).parse('01:10:00:00')).toBe(17982);
	});
});

describe('what a person types against the programme clock', () => {
	test('a timecode before the start is refused with a message naming the start', () => {
		const clock = clockOf('29.97', false);
		const typed = readTypedTime('start', () => clock.parse('00:04:30:00'));
		expect(typed.ok).toBe(false);
		if (!typed.ok) {
			expect(typed.field).toBe('start');
			expect(typed.message).toContain('01:00:00:00');
			expect(typed.message).toContain('before the start');
		}
	});

	test('a clock time counts from the start of the cut, without the offset', () => {
		// tests/REFERENCES.md, "Frame rates": 4:30 is 270 s × 30000/1001 = 8091.9 frames; the
		// nearest frame is 8092 (our rounding rule), with or without a timecode start.
		expect(clockOf('29.97', false).parse('4:30')).toBe(8092);
		expect(clockOf('29.97', false, '00:00:00:00').parse('4:30')).toBe(8092);
	});

	test('a chapter start typed as timecode lands on its label; a clock time on the first frame at or after it', () => {
		const clock = clockOf('29.97', false);
		expect(chapterStartFromText('01:00:10:00', clock)).toBe(300);
		// tests/REFERENCES.md, "Frame rates": ten seconds are 299.7 frames, so the first frame at or
		// after 0:10 is 300.
		expect(chapterStartFromText('0:10', clock)).toBe(300);
	});

	test('a drop-frame label typed on a non-drop timeline is refused, not silently moved', () => {
		const clock = clockOf('29.97', false);
		expect(() => clock.parse('01:10:00;00')).toThrow(TimecodeError);
		expect(() => clock.parse('01:10:00;00')).toThrow(/non-drop/);
	});

	test('lengths are read and shown in the form but without the start', () => {
		// tests/REFERENCES.md, "Timecode": 00:13:40 non-drop at 29.97 is 820 × 30 = 24600 labels.
		const clock = clockOf('29.97', false);
		expect(clock.parseLength('00:13:40:00')).toBe(24600);
		expect(clock.formatLength(24600)).toBe('00:13:40:00');
		expect(referenceTimecode('00:13:40:00', [30000, 1001], false).frameCount).toBe(24600);
	});

	test('a start that is not a label, or a skipped drop-frame label, is a TimecodeError', () => {
		expect(() => clockOf('29.97', false, '1 hour')).toThrow(TimecodeError);
		// tests/REFERENCES.md, "Timecode": ;00 and ;01 are skipped at minute 01 in drop-frame.
		expect(() => clockOf('29.97', true, '01:01:00:00')).toThrow(/doesn't exist in drop-frame/);
		// At 25 fps the frames run 00 to 24 (tests/REFERENCES.md, "Timecode").
		expect(() => clockOf('25', false, '01:00:00:25')).toThrow(/frames go from 00 to 24/);
	});
});

describe('programmeTimecode: the stored setting with its defaults', () => {
	test('no choice stored means drop-frame at 29.97 and 59.94 and non-drop elsewhere, from 00:00:00:00', () => {
		// Common practice: NTSC-rate programmes are labelled drop-frame unless the edit says otherwise.
		expect(programmeTimecode({ frameRate: '29.97', timecodeDropFrame: null })).toEqual({
			frameRate: '29.97',
			dropFrame: true,
			start: '00:00:00:00'
		});
		expect(programmeTimecode({ frameRate: '59.94' }).dropFrame).toBe(true);
		expect(programmeTimecode({ frameRate: '25' }).dropFrame).toBe(false);
		expect(
			programmeTimecode({
				frameRate: '29.97',
				timecodeDropFrame: false,
				timecodeStart: '01:00:00:00'
			})
		).toEqual({ frameRate: '29.97', dropFrame: false, start: '01:00:00:00' });
	});

	test('a start of 00:00:00:00 shows positions exactly as before', () => {
		// tests/REFERENCES.md, "Timecode": 00:10:00;00 is frame 17982 at 29.97 drop-frame.
		const clock = programmeClock(programmeTimecode({ frameRate: '29.97' }));
		expect(clock.format(17982)).toBe('00:10:00;00');
		expect(clock.parse('00:10:00;00')).toBe(17982);
	});
});
