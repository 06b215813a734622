import { describe, expect, test } from 'vitest';
import converter from 'number-to-words';
import { cardinalWordCount, spokenWordsInToken } from '../../src/lib/script/spoken-numbers.ts';
import { countSpokenWords, roughSpokenWords } from '../../src/lib/script/timing.ts';

// How figures and units are read aloud is common practice for US English (from memory); the
// counting rules built on it are our own (src/lib/script/spoken-numbers.ts). Each expansion is
// written out beside its check and counted by hand. tests/REFERENCES.md, "Numbers read aloud".

/** Spoken words in number-to-words' cardinal spelling: "two hundred eighty-five" → 4. */
function referenceCardinalWords(whole: number): number {
	return converter
		.toWords(whole)
		.split(/[\s,-]+/)
		.filter(Boolean).length;
}

describe('cardinalWordCount', () => {
	test('agrees with the npm package number-to-words on every number up to 3,000', () => {
		// Reference library: number-to-words 1.2 (MIT), toWords(); it writes US cardinals without
		// "and", and a hyphenated tens-and-units pair ("eighty-five") is two spoken words.
		for (let whole = 0; whole <= 3000; whole += 1) {
			expect(cardinalWordCount(whole), String(whole)).toBe(referenceCardinalWords(whole));
		}
	});

	test('agrees with number-to-words on large numbers up to the hundreds of billions', () => {
		for (const whole of [10_000, 99_999, 100_001, 1_000_000, 7_250_013, 999_999_999_999]) {
			expect(cardinalWordCount(whole), String(whole)).toBe(referenceCardinalWords(whole));
		}
	});

	test('worked examples', () => {
		expect(cardinalWordCount(95)).toBe(2); // ninety-five
		expect(cardinalWordCount(285)).toBe(4); // two hundred eighty-five
		expect(cardinalWordCount(1200)).toBe(4); // one thousand two hundred
	});
});

describe('spokenWordsInToken (common practice for reading figures aloud, from memory)', () => {
	test.each([
		['285/70R17', 7, 'two hundred eighty-five seventy R seventeen'],
		['17x8.5', 5, 'seventeen by eight point five'],
		['95', 2, 'ninety-five'],
		['ft-lbs', 2, 'foot pounds'],
		['95ft-lbs', 4, 'ninety-five foot pounds'],
		['psi', 3, 'P S I'],
		['PSI.', 3, 'P S I'],
		['1/2-inch', 3, 'one half inch'],
		['3/8', 2, 'three eighths'],
		['M12', 2, 'M twelve'],
		['M12x1.5', 6, 'M twelve by one point five'],
		['8.5', 3, 'eight point five'],
		['0.75', 4, 'zero point seven five'],
		['90–100', 4, 'ninety to one hundred'],
		['90-100', 4, 'ninety to one hundred'],
		['1,200', 4, 'one thousand two hundred'],
		['2004', 3, 'two thousand four'],
		['1998', 3, 'nineteen ninety-eight'],
		['1500', 2, 'fifteen hundred'],
		['1905', 3, 'nineteen oh five'],
		['2024', 3, 'twenty twenty-four'],
		['21st', 2, 'twenty-first'],
		['4WD', 3, 'four W D'],
		['LT285/75R16', 10, 'L T two hundred eighty-five seventy-five R sixteen'],
		['200°F', 4, 'two hundred degrees F'],
		['50%', 2, 'fifty percent'],
		['(35', 2, 'thirty-five'],
		['007', 3, 'oh oh seven'],
		['1/2/2026', 5, 'one two twenty twenty-six: a date, not a half'],
		['torque', 1, 'an ordinary word'],
		['and/or', 1, 'a slash-joined word stays one']
	])('%s is %i spoken words (%s)', (token, words) => {
		expect(spokenWordsInToken(token)).toBe(words);
	});
});

describe('countSpokenWords reads figures and units as spoken', () => {
	test('the spec-heavy sentence: 17 tokens, 32 spoken words', () => {
		const sentence =
			'Torque the lug nuts to 95 ft-lbs, air the 285/70R17 tyres to 35 psi on 17x8.5 wheels.';
		// Counted by hand, as it is read aloud (common practice, from memory):
		// Torque the lug nuts to (5)
		// + ninety-five (2) + foot pounds (2)                                   = 9
		// + air the (2)                                                          = 11
		// + two hundred eighty-five seventy R seventeen (7)                      = 18
		// + tyres to (2) + thirty-five (2) + P S I (3)                           = 25
		// + on (1) + seventeen by eight point five (5) + wheels (1)              = 32
		// The old rule counted one word per whitespace-separated token: 17.
		expect(sentence.split(/\s+/).length).toBe(17);
		expect(countSpokenWords(sentence)).toBe(32);
	});

	test('the rough count (over the time limit) reads figures the same way', () => {
		const sentence =
			'Torque the lug nuts to 95 ft-lbs, air the 285/70R17 tyres to 35 psi on 17x8.5 wheels.';
		expect(roughSpokenWords(sentence)).toBe(32);
	});

	test('a range and a fraction inside Markdown', () => {
		// Check (1) after (1) ninety to one hundred (4) miles (1) with the one half inch (5) drive (1)
		expect(countSpokenWords('Check after **90–100** miles with the 1/2-inch drive.')).toBe(13);
	});

	test('figures inside inline code stay unspoken (part numbers)', () => {
		expect(countSpokenWords('Part `285-70-17` here')).toBe(2);
	});
});
