/**
 * Reading time of on-screen text (caution cards, spec cards). The pace, about 17 characters a
 * second, is the subtitle reading speed for adults: common practice, from memory of broadcasters'
 * subtitling guides (tests/REFERENCES.md, "Reading speed"). The worked examples are plain
 * arithmetic on that figure: seconds = characters ÷ 17, rounded up to a whole second.
 */
import { describe, expect, test } from 'vitest';
import {
	READING_CHARACTERS_PER_SECOND,
	onScreenText,
	readableCharacters,
	readingNeed,
	readingSeconds
} from '../../src/lib/reading-time';
import { renderSpecCard } from '../../src/lib/specs';
import { HAZARDS } from '../../src/lib/cautions';

describe('readingSeconds', () => {
	test('the pace is 17 characters a second (subtitle practice, from memory; REFERENCES "Reading speed")', () => {
		expect(READING_CHARACTERS_PER_SECOND).toBe(17);
	});

	test('worked examples: characters ÷ 17, rounded up (REFERENCES "Reading speed")', () => {
		// 687 ÷ 17 = 40.41… → 41 s: the lift card of the bug report.
		expect(687 / 17).toBeCloseTo(40.41, 2);
		expect(readingSeconds(687)).toBe(41);
		// 102 ÷ 17 = 6 exactly → 6 s; one character more needs a seventh second.
		expect(readingSeconds(102)).toBe(6);
		expect(readingSeconds(103)).toBe(7);
		// 140 characters (the longest caution card) ÷ 17 = 8.24 → 9 s.
		expect(readingSeconds(140)).toBe(9);
		// 17 characters → 1 s; 1 character still needs a whole second; nothing needs none.
		expect(readingSeconds(17)).toBe(1);
		expect(readingSeconds(1)).toBe(1);
		expect(readingSeconds(0)).toBe(0);
		expect(readingSeconds('')).toBe(0);
	});

	test('white space runs count once and the ends are trimmed; a code point is one character', () => {
		expect(readableCharacters('  Torque   to\n85 ft·lbf  ')).toBe('Torque to 85 ft·lbf'.length);
		// "é" written as one code point and "🔧" (one code point, two UTF-16 units) each count once.
		expect(readableCharacters('é🔧')).toBe(2);
		expect(readingSeconds('x'.repeat(35))).toBe(3); // 35 ÷ 17 = 2.06 → 3 s
	});

	test('counts as the definition does: collapse white space (JavaScript \\s), trim, count code points', () => {
		// The definition written out the slow way (ECMAScript: \\s is white space and line
		// terminators; Array.from splits a string into code points, a lone surrogate counting one).
		const byDefinition = (text: string) => Array.from(text.replace(/\s+/g, ' ').trim()).length;
		const pieces = [
			' ',
			'\t',
			'\n',
			'\r\n',
			'\u00a0',
			'\u2003',
			'\u2028',
			'\ufeff',
			'a',
			'é',
			'🔧',
			'\ud83d',
			'\udd27',
			'·',
			'Z'
		];
		let seed = 7;
		const next = () => (seed = (seed * 1103515245 + 12345) % 2147483648);
		for (let round = 0; round < 2000; round++) {
			let text = '';
			for (let length = next() % 12; length > 0; length--) text += pieces[next() % pieces.length];
			expect(readableCharacters(text), JSON.stringify(text)).toBe(byDefinition(text));
		}
	});

	test('every default caution card reads in at most 9 s at 17 characters a second', () => {
		for (const hazard of HAZARDS) {
			const characters = readableCharacters(hazard.defaultCaution);
			expect(readingSeconds(hazard.defaultCaution)).toBe(Math.ceil(characters / 17));
			expect(readingSeconds(hazard.defaultCaution)).toBeLessThanOrEqual(9);
		}
	});
});

describe('a spec card on screen', () => {
	test('a lift card with five cautions puts 687 characters on screen: 41 s, far past the 6 s default', () => {
		const card = renderSpecCard({
			kind: 'lift',
			frontLiftIn: 2,
			rearLiftIn: 3,
			frontSuspension: 'coil',
			rearSuspension: 'leaf',
			method: { front: 'coil-spacer', rear: 'coilovers' }
		});
		expect(card.cautions).toHaveLength(5);
		const characters = readableCharacters(onScreenText(card));
		expect(characters).toBe(687);
		expect(readingSeconds(characters)).toBe(41); // 687 ÷ 17 = 40.4 → 41 s
		expect(readingNeed(41, 6)).toEqual({ enough: false, text: 'needs 41 s to read; shown 6 s' });
	});

	test('a torque card reads in a few seconds and the default 6 s is enough', () => {
		const card = renderSpecCard({
			kind: 'torque',
			value: 85,
			unit: 'ft·lbf',
			fastener: 'U-bolt nuts'
		});
		const text = onScreenText(card);
		const needed = readingSeconds(text);
		expect(needed).toBe(Math.ceil(readableCharacters(text) / 17));
		expect(needed).toBeLessThanOrEqual(6);
		expect(readingNeed(needed, 6).enough).toBe(true);
	});

	test('the preview words: "needs 9 s to read; shown 6 s", decimals as typed', () => {
		expect(readingNeed(9, 6).text).toBe('needs 9 s to read; shown 6 s');
		expect(readingNeed(9, 9.5)).toEqual({ enough: true, text: 'needs 9 s to read; shown 9.5 s' });
	});
});
