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
	return Array.from(text.replace(/\s+/g, ' ').trim()).length;
}

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
