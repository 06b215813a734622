/**
 * What video platforms count and refuse in a description and a title, shared by the publish kit
 * on the server and its page in the browser. From memory of a large platform's upload
 * documentation: a description of at most 5,000 bytes (UTF-8) and a title of at most 100
 * characters, neither containing `<` or `>`. Where a count could be read two ways, the stricter
 * one is taken, so text that passes here is not refused there.
 */

/** Longest description a platform takes, counted in UTF-8 bytes (from memory). */
export const DESCRIPTION_MAX = 5000;
/** Longest title a platform takes (from memory). */
export const TITLE_MAX = 100;

const encoder = new TextEncoder();

/** UTF-8 bytes (RFC 3629): a “°” counts 2, an emoji 4, so the count never runs short. */
export const descriptionLength = (text: string): number => encoder.encode(text).length;

/** UTF-16 code units: an emoji counts 2, the stricter of the usual character counts. */
export const titleLength = (text: string): number => text.length;

export interface ForbiddenMark {
	character: '<' | '>';
	/** 1-based, as a person counts lines and characters on screen. */
	line: number;
	column: number;
}

/** Every `<` and `>` with its line and column (columns in code points, as the eye counts). */
export function forbiddenMarks(text: string): ForbiddenMark[] {
	const marks: ForbiddenMark[] = [];
	text.split('\n').forEach((lineText, index) => {
		[...lineText].forEach((character, position) => {
			if (character === '<' || character === '>')
				marks.push({ character, line: index + 1, column: position + 1 });
		});
	});
	return marks;
}

const where = (mark: ForbiddenMark) =>
	`“${mark.character}” on line ${mark.line}, column ${mark.column}`;

/** What would get the description refused, in the merch team's words; [] when it would go through. */
export function descriptionProblems(text: string, limit: number): string[] {
	const problems: string[] = [];
	const length = descriptionLength(text);
	if (length > limit)
		problems.push(
			`The description is ${length.toLocaleString('en')} of ${limit.toLocaleString('en')} allowed: cut ${(length - limit).toLocaleString('en')} (accents and symbols count 2, emoji 4).`
		);
	const marks = forbiddenMarks(text);
	if (marks.length > 0)
		problems.push(
			`Video platforms refuse < and > in a description: take out ${marks.map(where).join('; ')} (write “under” or “over”, or use an arrow →).`
		);
	return problems;
}

/** What would get the title refused, in the merch team's words. */
export function titleProblems(title: string): string[] {
	const problems: string[] = [];
	const length = titleLength(title);
	if (length > TITLE_MAX)
		problems.push(
			`The title is ${length} characters; video platforms take ${TITLE_MAX}: shorten it by ${length - TITLE_MAX} on the episode page (emoji count 2).`
		);
	const marks = forbiddenMarks(title);
	if (marks.length > 0)
		problems.push(
			`Video platforms refuse < and > in a title: take out ${marks.map((mark) => `“${mark.character}” at character ${mark.column}`).join('; ')}.`
		);
	return problems;
}
