/**
 * How many words a host says for one written token that holds figures or a unit: "285/70R17" is
 * "two hundred eighty-five seventy R seventeen", seven spoken words, not one. Pure and linear in
 * the token's length (the rough count in `timing.ts` runs it on hostile text). The rules are our
 * own, built on common practice for reading numbers aloud in US English (from memory):
 *
 * - A whole number is read as a cardinal without "and": 95 → "ninety-five" (2 words: a hyphenated
 *   number is two spoken words), 285 → "two hundred eighty-five" (4), 1,200 → "one thousand two
 *   hundred" (4), 2004 → "two thousand four" (3). Four figures without a comma from 1100 to 1999
 *   and from 2010 to 2099 are read in pairs, as years and engine speeds are: 1998 → "nineteen
 *   ninety-eight" (3), 1500 → "fifteen hundred" (2), 1905 → "nineteen oh five" (3). A number with a
 *   leading zero ("007") or more than twelve digits (a serial) is read digit by digit.
 * - A decimal is its whole part, "point", then one word per digit: 8.5 → "eight point five" (3).
 * - A fraction whose denominator is 2, 3, 4, 8, 16, 32 or 64 and above its numerator is the
 *   numerator and one word: 1/2 → "one half", 3/8 → "three eighths" (2). Any other slash between
 *   figures is silent: 285/70 → "two hundred eighty-five seventy".
 * - A hyphen or en dash between two figures is "to": 90–100 → "ninety to one hundred" (4). Next to
 *   letters it is silent: 1/2-inch → "one half inch" (3).
 * - "x" or "×" between figures is "by" (one word, as any single letter is): 17x8.5 → "seventeen by
 *   eight point five" (5).
 * - Letters beside figures: a unit from `UNIT_WORDS` counts as spoken there ("ft-lbs" → "foot
 *   pounds", 2; "psi" → "P S I", 3), a run of up to four capitals is spelt out ("LT" → 2, "M" in M12
 *   → 1, "WD" in 4WD → 2), an ordinal ending (st, nd, rd, th) adds nothing (21st → "twenty-first",
 *   2), any other run is one word ("inch").
 * - Symbols beside figures: % ("percent"), ° ("degrees"), $ ("dollars"), + ("plus"), # ("number")
 *   and & ("and") are one word each; other punctuation is silent.
 * - A token without figures is one word, unless it is a unit of `UNIT_WORDS` ("psi" → 3 wherever it
 *   stands).
 */

/** Units that read as more (or other) than one word, keyed in lower case; common practice, from memory. */
export const UNIT_WORDS: Readonly<Record<string, number>> = {
	'ft-lbs': 2, // foot pounds
	'ft-lb': 2,
	'lb-ft': 2,
	'lbs-ft': 2,
	'ft·lbf': 2,
	'lbf·ft': 2,
	'in-lbs': 2, // inch pounds
	'in-lb': 2,
	'lb-in': 2,
	nm: 2, // newton metres
	'n·m': 2,
	'n-m': 2,
	psi: 3, // P S I
	kpa: 2, // kilopascals, read "K P A" by many: counted as two as a middle course
	rpm: 3, // R P M
	mph: 3, // miles per hour
	kph: 3,
	'km/h': 3,
	cfm: 3, // C F M
	cc: 2, // C C
	awd: 3,
	'4wd': 3
};

const SMALL_DENOMINATORS = new Set([2, 3, 4, 8, 16, 32, 64]);
const ONE_WORD_SYMBOLS = new Set(['%', '°', '$', '+', '#', '&', '×']);
const DASHES = new Set(['-', '–', '‐', '‑']);
const ORDINAL_ENDINGS = new Set(['st', 'nd', 'rd', 'th']);
const hasDigit = /[0-9]/;
// One piece at a time: a number (1,200 · 8.5), a run of letters joined by - · / (ft-lbs), or one
// other character. No alternative can match what another already covered, so the scan is linear.
const piecePattern = /(\d+(?:,\d{3})*(?:\.\d+)?)|(\p{L}+(?:[-·/]\p{L}+)*)|([\s\S])/gu;

/** Words in the US cardinal reading of a whole number below 10¹² (no "and"; "ninety-five" is two). */
export function cardinalWordCount(whole: number): number {
	if (!Number.isSafeInteger(whole) || whole < 0)
		throw new RangeError(`Not a whole number: ${whole}`);
	if (whole === 0) return 1;
	let words = 0;
	let rest = whole;
	for (const scale of [1e9, 1e6, 1e3]) {
		const group = Math.floor(rest / scale);
		if (group > 0) words += belowThousandWords(group) + 1; // "… billion", "… million", "… thousand"
		rest %= scale;
	}
	return words + (rest > 0 ? belowThousandWords(rest) : 0);
}

function belowThousandWords(value: number): number {
	const hundreds = Math.floor(value / 100);
	const rest = value % 100;
	let words = hundreds > 0 ? 2 : 0; // "two hundred"
	if (rest === 0) return words;
	words += rest < 20 || rest % 10 === 0 ? 1 : 2; // "seventeen", "seventy", "eighty-five"
	return words;
}

/** Words for the digits of a whole-number text: cardinal, or digit by digit for a serial or a leading zero. */
function wholeTextWords(digits: string): number {
	const plain = digits.replace(/,/g, '');
	if (plain.length > 12 || (plain.length > 1 && plain.startsWith('0'))) return plain.length;
	const value = Number(plain);
	if (
		digits.length === 4 &&
		((value >= 1100 && value <= 1999) || (value >= 2010 && value <= 2099))
	) {
		const low = value % 100;
		// "nineteen" + "hundred" | "oh five" | "ninety-eight"
		return (
			cardinalWordCount(Math.floor(value / 100)) +
			(low === 0 ? 1 : low < 10 ? 2 : cardinalWordCount(low))
		);
	}
	return cardinalWordCount(value);
}

function numberWords(text: string): number {
	const point = text.indexOf('.');
	if (point === -1) return wholeTextWords(text);
	return wholeTextWords(text.slice(0, point)) + 1 + (text.length - point - 1);
}

function letterWords(run: string, afterNumber: boolean): number {
	const lower = run.toLowerCase();
	const unit = UNIT_WORDS[lower];
	if (unit !== undefined) return unit;
	if (afterNumber && ORDINAL_ENDINGS.has(lower)) return 0;
	if (/^\p{Lu}{1,4}$/u.test(run)) return run.length;
	if (run.includes('-') || run.includes('/') || run.includes('·')) {
		return run.split(/[-·/]/).reduce((sum, part) => sum + letterWords(part, false), 0);
	}
	return 1;
}

type Piece =
	| { kind: 'number'; text: string }
	| { kind: 'letters'; text: string }
	| { kind: 'mark'; text: string };

/**
 * Spoken words for one whitespace-free token that `countSpokenWords` already accepted as a word.
 * A token without figures is 1 (or its unit's count); one with figures is read by the rules above.
 */
export function spokenWordsInToken(token: string): number {
	if (!hasDigit.test(token)) {
		const bare = token.replace(/^[^\p{L}\p{N}]+|[^\p{L}\p{N}]+$/gu, '').toLowerCase();
		return UNIT_WORDS[bare] ?? 1;
	}
	const pieces: Piece[] = [];
	piecePattern.lastIndex = 0;
	for (const match of token.matchAll(piecePattern)) {
		if (match[1] !== undefined) pieces.push({ kind: 'number', text: match[1] });
		else if (match[2] !== undefined) pieces.push({ kind: 'letters', text: match[2] });
		else pieces.push({ kind: 'mark', text: match[3] });
	}
	let words = 0;
	for (let index = 0; index < pieces.length; index += 1) {
		const piece = pieces[index];
		const previous = pieces[index - 1];
		const next = pieces[index + 1];
		if (piece.kind === 'number') {
			const fraction = fractionAfter(
				piece,
				pieces[index + 1],
				pieces[index + 2],
				previous,
				pieces[index + 3]
			);
			if (fraction !== null) {
				words += fraction;
				index += 2;
			} else words += numberWords(piece.text);
		} else if (piece.kind === 'letters') {
			words += letterWords(piece.text, previous?.kind === 'number');
		} else if (ONE_WORD_SYMBOLS.has(piece.text)) {
			words += 1;
		} else if (DASHES.has(piece.text) && previous?.kind === 'number' && next?.kind === 'number') {
			words += 1; // "to"
		}
	}
	return words;
}

/** "3/8" read as a fraction ("three eighths"): its word count, or null when it is not one. */
function fractionAfter(
	numerator: Piece,
	slash: Piece | undefined,
	denominator: Piece | undefined,
	before: Piece | undefined,
	after: Piece | undefined
): number | null {
	if (slash?.text !== '/' || denominator?.kind !== 'number') return null;
	// Part of a longer run of slashes (a date) is not a fraction.
	if (before?.text === '/' || after?.text === '/') return null;
	if (/[.,]/.test(numerator.text) || /[.,]/.test(denominator.text)) return null;
	const top = Number(numerator.text);
	const bottom = Number(denominator.text);
	if (!SMALL_DENOMINATORS.has(bottom) || top <= 0 || top >= bottom) return null;
	return numberWords(numerator.text) + 1;
}
