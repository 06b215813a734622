/**
 * $lib/date-format: each formatter is made once and formats exactly as a freshly made
 * `Intl.DateTimeFormat('en', options)` does. The reference is the engine's own ECMA-402 Intl with
 * the Unicode CLDR English patterns (tests/REFERENCES.md, "Dates in English"); the expected
 * strings below are CLDR's English forms (public).
 */
import { describe, expect, test } from 'vitest';
import { dateFormat } from '$lib/date-format';

const day = new Date('2026-12-03T15:04:00Z');

describe('dateFormat', () => {
	test('the same options give the same formatter, made once', () => {
		const options = { month: 'short', day: 'numeric', timeZone: 'UTC' } as const;
		expect(dateFormat(options)).toBe(dateFormat({ ...options }));
		expect(dateFormat(options)).not.toBe(dateFormat({ dateStyle: 'medium', timeZone: 'UTC' }));
	});

	test.each([
		[{ month: 'short', day: 'numeric', timeZone: 'UTC' }, 'Dec 3'],
		[{ dateStyle: 'medium', timeZone: 'UTC' }, 'Dec 3, 2026'],
		[{ dateStyle: 'full', timeZone: 'UTC' }, 'Thursday, December 3, 2026'],
		[
			{ weekday: 'short', day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' },
			'Thu, Dec 3, 2026'
		]
	] as [Intl.DateTimeFormatOptions, string][])(
		'%o formats as CLDR English and as a fresh Intl formatter',
		(options, expected) => {
			expect(dateFormat(options).format(day)).toBe(expected);
			expect(dateFormat(options).format(day)).toBe(
				new Intl.DateTimeFormat('en', options).format(day)
			);
		}
	);
});
