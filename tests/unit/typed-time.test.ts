/**
 * Reading time a person types (parseTypedTime, readTypedTime) against outside sources.
 *
 * Drop-frame labels follow SMPTE ST 12-1 as restated in tests/REFERENCES.md, "Timecode" (the
 * standard itself is paywalled); each count is cross-checked with the npm package
 * `smpte-timecode`, run here as a second opinion. Clock times use the exact 1000/1001 rates
 * (tests/REFERENCES.md, "Frame rates").
 */
import { createRequire } from 'node:module';
import { describe, expect, test } from 'vitest';
import { parseTypedTime, readTypedTime, TimecodeError } from '$lib/timecode';

/** The part of smpte-timecode's API used here. */
type SmpteTimecodeFactory = (
	timecode: number | string,
	frameRate: [number, number],
	dropFrame: boolean
) => { frameCount: number };

// smpte-timecode ships CommonJS without type declarations, so it is loaded through require.
const referenceTimecode = createRequire(import.meta.url)('smpte-timecode') as SmpteTimecodeFactory;

describe('parseTypedTime: typed time read the way the pages show it', () => {
	test('00:10:00;00 at 29.97 is frame 17982 (ten drop-frame minutes)', () => {
		// tests/REFERENCES.md, "Timecode": 10 × 60 × 30 − 9 × 2 = 17982.
		expect(parseTypedTime('00:10:00;00', '29.97')).toBe(17982);
		expect(referenceTimecode('00:10:00;00', [30000, 1001], true).frameCount).toBe(17982);
	});

	test('at 29.97 a colon before the frames is still read as drop-frame, as the page shows it', () => {
		// tests/REFERENCES.md, "Timecode": the label after 00:00:59;29 is 00:01:00;02, frame 1800.
		expect(parseTypedTime('00:01:00:02', '29.97')).toBe(1800);
		expect(referenceTimecode('00:01:00;02', [30000, 1001], true).frameCount).toBe(1800);
	});

	test('at 59.94 four labels go each minute: 00:10:00;00 is frame 35964', () => {
		// tests/REFERENCES.md, "Timecode": 35964 frames per ten minutes at 59.94 drop-frame.
		expect(parseTypedTime('00:10:00:00', '59.94')).toBe(35964);
		expect(referenceTimecode('00:10:00;00', [60000, 1001], true).frameCount).toBe(35964);
	});

	test('at 25 fps nothing is dropped: 00:10:00:00 is frame 15000', () => {
		// tests/REFERENCES.md, "Timecode": non-drop counts every label, 10 × 60 × 25 = 15000.
		expect(parseTypedTime('00:10:00:00', '25')).toBe(15000);
		expect(referenceTimecode('00:10:00:00', [25, 1], false).frameCount).toBe(15000);
	});

	test('clock text 13:40 at 29.97 is the nearest frame, 24575', () => {
		// tests/REFERENCES.md, "Frame rates": 820 s × 30000 ÷ 1001 = 24575.42…, nearest frame 24575.
		expect(parseTypedTime('13:40', '29.97')).toBe(24575);
	});
});

describe('readTypedTime: a typing mistake comes back on its field', () => {
	test('a frame that reads comes back as the frame', () => {
		// tests/REFERENCES.md, "Timecode": 00:01:10;00 → 70 × 30 − 2 × (1 − 0) = 2098.
		expect(readTypedTime('start', () => parseTypedTime('00:01:10;00', '29.97'))).toEqual({
			ok: true,
			frame: 2098
		});
	});

	test('a label drop-frame skips is refused on its field, naming the next label', () => {
		// tests/REFERENCES.md, "Timecode": ;00 and ;01 are left out at the start of minute 01,
		// so 00:01:00;00 names no frame and the next label is 00:01:00;02.
		const typed = readTypedTime('duration', () => parseTypedTime('00:01:00;00', '29.97'));
		expect(typed.ok).toBe(false);
		if (typed.ok) return;
		expect(typed.field).toBe('duration');
		expect(typed.message).toContain('00:01:00;02');
	});

	test('drop-frame written at 25 fps is refused on its field', () => {
		// tests/REFERENCES.md, "Timecode": drop-frame exists only at 29.97 and 59.94.
		const read = () => parseTypedTime('01:00:00;00', '25');
		expect(read).toThrow(TimecodeError);
		// The field shows the parser's own words.
		let parserMessage = '';
		try {
			read();
		} catch (failure) {
			parserMessage = (failure as Error).message;
		}
		expect(readTypedTime('at', read)).toEqual({ ok: false, field: 'at', message: parserMessage });
	});

	test('a failure that is not a typing mistake is thrown on, not shown as one', () => {
		expect(() =>
			readTypedTime('at', () => {
				throw new TypeError('a bug');
			})
		).toThrow(TypeError);
	});
});
