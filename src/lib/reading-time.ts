/**
 * How long on-screen text needs to be read: caution cards and spec cards are checked against it.
 * Pure; shared by the forms' previews, the server's save checks and the lock gate.
 *
 * The pace is about 17 characters a second, the figure subtitle guidelines use for adult viewers
 * (common practice for subtitles, quoted from memory of broadcasters' subtitling guides, which
 * give roughly 15–20 characters a second; see tests/REFERENCES.md, "Reading speed"). A card is
 * read once, start to finish, while the picture goes on, so the subtitle pace fits it.
 */

/** Characters a viewer reads per second (common practice for subtitles; the figure is from memory). */
export const READING_CHARACTERS_PER_SECOND = 17;

/** What the help beside a duration field says about the pace. */
export const READING_PACE_NOTE = `about ${READING_CHARACTERS_PER_SECOND} characters a second, the usual subtitle reading pace (a figure from memory)`;

/**
 * Characters a viewer reads in a text: runs of white space count as one space, the ends are
 * trimmed, and a character is a Unicode code point (an emoji or an accented letter is one).
 */
export function readableCharacters(text: string): number {
	// Counted in one pass without building the collapsed text (the gate counts every caution's
	// words on every episode page and API call): a white-space run between characters adds one, a
	// surrogate pair (one code point in two UTF-16 units) adds one.
	let count = 0;
	let spaceBefore = false;
	for (let index = 0; index < text.length; index++) {
		const unit = text.charCodeAt(index);
		if (isLowSurrogate(unit) && index > 0 && isHighSurrogate(text.charCodeAt(index - 1))) continue;
		if (isWhiteSpace(unit, text, index)) {
			spaceBefore = count > 0;
			continue;
		}
		count += spaceBefore ? 2 : 1;
		spaceBefore = false;
	}
	return count;
}

const isHighSurrogate = (unit: number) => unit >= 0xd800 && unit <= 0xdbff;
const isLowSurrogate = (unit: number) => unit >= 0xdc00 && unit <= 0xdfff;
const WHITE_SPACE = /\s/;
/** JavaScript's `\s`: tab to carriage return and the space at once, the rest through the regex. */
const isWhiteSpace = (unit: number, text: string, index: number) =>
	unit === 32 || (unit >= 9 && unit <= 13) || (unit > 127 && WHITE_SPACE.test(text[index]));

/** Whole seconds the text needs on screen: characters ÷ 17, rounded up; at least 1 s for any text, 0 for none. */
export function readingSeconds(textOrCharacters: string | number): number {
	const characters =
		typeof textOrCharacters === 'number' ? textOrCharacters : readableCharacters(textOrCharacters);
	if (characters <= 0) return 0;
	return Math.ceil(characters / READING_CHARACTERS_PER_SECOND);
}

/** The words of a card as they read on screen, joined with spaces: heading, lines, body, cautions. */
export function onScreenText(card: {
	heading: string;
	lines: readonly { label: string; imperial: string; metric: string }[];
	cautions: readonly string[];
	body?: string;
}): string {
	return [
		card.heading,
		...card.lines.map((line) => `${line.label} ${line.imperial} ${line.metric}`),
		card.body ?? '',
		...card.cautions
	].join(' ');
}

/** "needs 9 s to read; shown 6 s": what a preview or a refusal says about a card's time on screen. */
export function readingNeed(
	neededSeconds: number,
	shownSeconds: number
): { enough: boolean; text: string } {
	const shown = Number.isInteger(shownSeconds)
		? String(shownSeconds)
		: shownSeconds.toFixed(1).replace(/\.0$/, '');
	return {
		enough: shownSeconds >= neededSeconds,
		text: `needs ${neededSeconds} s to read; shown ${shown} s`
	};
}
