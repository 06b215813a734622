/**
 * Counted words ("1 file", "0 files") against the English cardinal plural rule of Unicode CLDR,
 * as the JavaScript engine's Intl.PluralRules implements it (tests/REFERENCES.md, "English plurals").
 */
import { describe, expect, test } from 'vitest';
import { counted, wordFor } from '../../src/lib/plural.ts';

// CLDR English cardinals: "one" only for 1 (integer, no visible fraction); everything else "other".
const cldr = new Intl.PluralRules('en');

describe('counted words', () => {
	test('singular exactly where CLDR English says "one", plural for zero and many', () => {
		for (const count of [0, 1, 2, 3, 11, 21, 101, 1.5, 0.5]) {
			const expected = cldr.select(count) === 'one' ? 'file' : 'files';
			expect(wordFor(count, 'file'), String(count)).toBe(expected);
		}
	});

	test('the count goes in front; an irregular plural is given', () => {
		expect(counted(0, 'file')).toBe('0 files');
		expect(counted(1, 'file')).toBe('1 file');
		expect(counted(2, 'file')).toBe('2 files');
		expect(counted(1, 'shot has', 'shots have')).toBe('1 shot has');
		expect(counted(4, 'shot has', 'shots have')).toBe('4 shots have');
	});
});
