/**
 * Script timing: how many words the host will say, how long that takes, and
 * whether a segment is running long or short. Pure; runs in the browser (live
 * count beside the editor) and on the server (rundown totals).
 *
 * What counts as a spoken word (our own rules, kept simple so a writer can
 * predict the count):
 * - Markdown syntax is not spoken: heading `#`, emphasis markers, list bullets
 *   and numbers, blockquote `>`, table pipes, task-list boxes.
 * - Code is not spoken: fenced and indented code blocks are skipped entirely,
 *   and so is inline `code` (crews use it for part numbers and notes to self).
 * - Links: the link text counts, the URL does not. Bare URLs (`https://…`,
 *   `www.…`) and e-mail addresses count as 0, wherever they appear.
 * - Images count as 0 (the alt text is for screen readers, not the host).
 * - HTML tags count as 0; text between them counts; HTML comments count as 0.
 * - Directions: anything inside `[[ … ]]` is a note for the crew (for example
 *   `[[B-roll: jack stands]]`) and is not spoken. A direction ends at the first
 *   `]]` and cannot run across a blank line, so a forgotten `]]` does not
 *   swallow the rest of the script; an unclosed `[[` is counted as spoken so
 *   the writer notices it in the total. Directions are removed before the
 *   Markdown is read, so they may hold anything; write `\[\[` for literal
 *   double brackets.
 * - A word is a run of characters between whitespace (or an em dash) holding
 *   at least one letter or digit. Hyphenated and slash-joined words are one
 *   word ("and/or"); a lone "&" is one word because it is read as "and".
 * - Figures and units count as they are read aloud (`spokenWordsInToken` in
 *   ./spoken-numbers): "285/70R17" is seven words, "95 ft-lbs" four, "35 psi"
 *   five.
 */
import { Lexer, type Token, type Tokens } from 'marked';
import { spokenWordsInToken } from './spoken-numbers';

/**
 * Presented speech runs about 150 words per minute (common practice; Lucas,
 * The Art of Public Speaking, cites 125–150 wpm for US speakers; radio
 * bulletins run 160–180 wpm per Rodero 2012, Text & Talk 32(3)). See
 * tests/REFERENCES.md, "Narration pace".
 */
export const DEFAULT_WORDS_PER_MINUTE = 150;

/** Calibration ignores readings shorter than this: the start and stop clicks dominate a very short one. */
export const CALIBRATION_MIN_SECONDS = 10;
/** Calibration ignores readings with fewer words than this, for the same reason. */
export const CALIBRATION_MIN_WORDS = 20;
/**
 * Our own range of speaking paces. Outside it a reading is almost certainly mistimed (stopped late,
 * started late, a long pause) rather than a real host's pace: it is refused as "not a speaking
 * pace", never clamped. Presented speech runs 125–150 wpm and radio bulletins 160–180 wpm (common
 * practice, from memory; tests/REFERENCES.md, "Narration pace"); the range leaves room either side.
 */
export const CALIBRATED_PACE_RANGE = { minimum: 80, maximum: 260 } as const;

/** Our own tolerance for "on time": ±5% of the target… */
export const RUNTIME_TOLERANCE_FRACTION = 0.05;
/** …or ±10 seconds, whichever is larger, so short segments are not flagged for a breath. */
export const RUNTIME_TOLERANCE_MIN_SECONDS = 10;

// Separate lexer options from marked's global defaults so another module's
// marked.use() cannot change how words are counted.
const lexerOptions = { gfm: true, breaks: false, pedantic: false } as const;

const directionPattern = /\[\[(?:(?!\n[ \t]*\n)[\s\S])*?\]\]/g;
const htmlCommentPattern = /<!--[\s\S]*?(?:-->|$)/g;
const htmlTagPattern = /<\/?[A-Za-z][^>]*>/g;
const urlLikePattern = /^[("'<[]*(?:[a-z][a-z0-9+.-]*:\/\/|www\.)\S*$/i;
const emailLikePattern = /^[("'<[]*(?:mailto:)?[^\s@]+@[^\s@]+\.[^\s@]+$/i;
const hasLetterOrDigit = /[\p{L}\p{N}]/u;
const namedEntities: Record<string, string> = {
	amp: '&',
	lt: '<',
	gt: '>',
	quot: '"',
	apos: "'",
	nbsp: ' ',
	ndash: '–',
	mdash: '—'
};

/** Turns the few HTML character references a writer might type into the characters they stand for. */
function decodeCharacterReferences(text: string): string {
	return text.replace(/&(#x[0-9a-f]+|#[0-9]+|[a-z]+);/gi, (whole, body: string) => {
		if (body.startsWith('#')) {
			const codePoint =
				body[1] === 'x' || body[1] === 'X'
					? Number.parseInt(body.slice(2), 16)
					: Number.parseInt(body.slice(1), 10);
			return codePoint > 0 && codePoint <= 0x10ffff ? String.fromCodePoint(codePoint) : ' ';
		}
		return namedEntities[body.toLowerCase()] ?? whole;
	});
}

/** Collects the spoken text of block tokens; blocks are separated by a blank line. */
function spokenTextOfBlocks(tokens: Token[]): string {
	return tokens.map(spokenTextOfBlock).join('\n\n');
}

function spokenTextOfBlock(token: Token): string {
	switch (token.type) {
		case 'code':
		case 'space':
		case 'hr':
		case 'def':
			return '';
		case 'html':
			// In an HTML block, tags mostly separate blocks (`<p>one</p><p>two</p>`), so they become spaces.
			return spokenTextOfHtml((token as Tokens.HTML).text, ' ');
		case 'list':
			return (token as Tokens.List).items
				.map((item) => spokenTextOfBlocks(item.tokens))
				.join('\n\n');
		case 'table': {
			const table = token as Tokens.Table;
			const cells = [table.header, ...table.rows].flat();
			return cells.map((cell) => spokenTextOfInline(cell.tokens)).join('\n\n');
		}
		case 'blockquote':
			return spokenTextOfBlocks((token as Tokens.Blockquote).tokens);
		case 'heading':
		case 'paragraph':
			return spokenTextOfInline((token as Tokens.Paragraph).tokens);
		case 'text': {
			// Inside tight list items marked gives block-level text tokens with inline children.
			const text = token as Tokens.Text;
			return text.tokens ? spokenTextOfInline(text.tokens) : text.text;
		}
		default: {
			// Tokens from extensions: read their children if they have any.
			const children = (token as Tokens.Generic).tokens;
			return children ? spokenTextOfBlocks(children) : '';
		}
	}
}

/** Collects the spoken text of inline tokens, joined without separators so "un**bolt**" stays one word. */
function spokenTextOfInline(tokens: Token[]): string {
	return tokens.map(spokenTextOfInlineToken).join('');
}

function spokenTextOfInlineToken(token: Token): string {
	switch (token.type) {
		case 'text':
		case 'escape': {
			const text = token as Tokens.Text;
			return text.tokens ? spokenTextOfInline(text.tokens) : text.text;
		}
		case 'strong':
		case 'em':
		case 'del':
			return spokenTextOfInline((token as Tokens.Strong).tokens);
		case 'link': {
			const link = token as Tokens.Link;
			// An autolink's text is the address itself, which the host does not read out.
			return link.autolink ? ' ' : spokenTextOfInline(link.tokens);
		}
		case 'html':
			// Inline tags sit inside or between words; dropping them must not split a word.
			return spokenTextOfHtml((token as Tokens.Tag).text, '');
		case 'codespan':
		case 'image':
		case 'br':
			return ' ';
		case 'checkbox':
			return '';
		default: {
			const children = (token as Tokens.Generic).tokens;
			return children ? spokenTextOfInline(children) : '';
		}
	}
}

function spokenTextOfHtml(html: string, tagReplacement: ' ' | ''): string {
	return html.replace(htmlCommentPattern, ' ').replace(htmlTagPattern, tagReplacement);
}

function isSpokenWord(candidate: string): boolean {
	if (candidate === '&') return true;
	if (!hasLetterOrDigit.test(candidate)) return false;
	return !urlLikePattern.test(candidate) && !emailLikePattern.test(candidate);
}

/** Counts the words a host will say from a segment's Markdown script (rules in this module's header). */
export function countSpokenWords(markdown: string): number {
	if (markdown.trim() === '') return 0;
	// Directions go before lexing, so nothing inside them (a clip URL, stray `**`)
	// can change how the surrounding Markdown is read.
	const withoutDirections = markdown.replace(/\r\n?/g, '\n').replace(directionPattern, ' ');
	const tokens = Lexer.lex(withoutDirections, lexerOptions);
	const spokenText = decodeCharacterReferences(spokenTextOfBlocks(tokens));
	let words = 0;
	for (const token of spokenText.split(/[\s—]+/u)) {
		if (isSpokenWord(token)) words += spokenWordsInToken(token);
	}
	return words;
}

/**
 * Our own limit on reading one script's Markdown (to HTML, or to a word count), in milliseconds.
 * `marked` is quadratic on some inputs inside the script limit, so both the server
 * (`$lib/server/episodes/script-reader`) and the editor (its word-count worker) read scripts off the
 * main thread and stop a read that runs longer; the answer is then the rough count below (and the
 * text as plain paragraphs). An ordinary script at the 100,000-character limit reads in about
 * 60–100 ms on a 2-core server, so this leaves room for a busy machine while keeping a preview's
 * answer under 200 ms.
 */
export const SCRIPT_READ_LIMIT_MS = 150;

/**
 * Same test as `isSpokenWord`, in one pass over the token with no backtracking, so a hostile
 * 100,000-character token costs 100,000 steps. Tokens come from a whitespace split, so they hold no
 * whitespace: an e-mail address is then exactly one "@" with something before it and a dot inside
 * what follows; an address starts, after any of ( " ' < [, with a scheme and "://" or with "www.".
 */
function isSpokenWordInOnePass(token: string): boolean {
	if (token === '&') return true;
	if (!hasLetterOrDigit.test(token)) return false;
	let start = 0;
	while (start < token.length && '("\'<['.includes(token[start])) start += 1;
	const rest = token.slice(start);
	if (/^(?:[a-z][a-z0-9+.-]*:\/\/|www\.)/i.test(rest)) return false;
	const at = token.indexOf('@');
	if (at > 0 && token.indexOf('@', at + 1) === -1) {
		const domain = token.slice(at + 1);
		// A dot with at least one character on each side of it, inside the domain.
		if (domain.lastIndexOf('.', domain.length - 2) >= 1) return false;
	}
	return true;
}

const blankLinePattern = /\n[ \t]*\n/g;

/**
 * Replaces `[[ … ]]` directions with a space exactly as `directionPattern` does, in linear time.
 * (The pattern retries from every `[[` when none closes, which is quadratic on `[[[[…`.) A
 * direction from `[[` at i is the text up to the first `]]` after i + 2, unless a blank line starts
 * before that `]]`; then no direction can start before that blank line either, so the scan jumps
 * past it.
 */
function withoutDirectionsInOnePass(text: string): string {
	let out = '';
	let copiedTo = 0;
	let position = 0;
	let nextClose = -1;
	let nextBlank = -1;
	for (;;) {
		const open = text.indexOf('[[', position);
		if (open === -1) break;
		if (nextClose < open + 2) nextClose = text.indexOf(']]', open + 2);
		if (nextClose === -1) break;
		if (nextBlank !== Number.POSITIVE_INFINITY && nextBlank < open + 2) {
			blankLinePattern.lastIndex = open + 2;
			nextBlank = blankLinePattern.exec(text)?.index ?? Number.POSITIVE_INFINITY;
		}
		if (nextBlank < nextClose) {
			position = nextBlank + 1;
			continue;
		}
		out += text.slice(copiedTo, open) + ' ';
		copiedTo = nextClose + 2;
		position = copiedTo;
	}
	return out + text.slice(copiedTo);
}

/**
 * A rough count of the spoken words, for a script whose Markdown cannot be read within
 * SCRIPT_READ_LIMIT_MS: directions are left out as usual, then every whitespace-separated token
 * that `countSpokenWords` would call a word counts, Markdown marks and code included. Linear in the
 * text's length. On prose without Markdown it gives the same number as `countSpokenWords`.
 */
export function roughSpokenWords(markdown: string): number {
	const text = withoutDirectionsInOnePass(markdown.replace(/\r\n?/g, '\n'));
	let words = 0;
	for (const token of decodeCharacterReferences(text).split(/[\s—]+/u)) {
		if (isSpokenWordInOnePass(token)) words += spokenWordsInToken(token);
	}
	return words;
}

function assertPositiveFinite(value: number, what: string): void {
	if (!Number.isFinite(value) || value <= 0) {
		throw new RangeError(`${what} must be a number above 0 (got ${value}).`);
	}
}

/** Seconds to speak a number of words at a pace: seconds = words ÷ wpm × 60. */
export function estimateSpokenSeconds(words: number, wordsPerMinute: number): number {
	if (!Number.isFinite(words) || words < 0) {
		throw new RangeError(`Word count must be 0 or more (got ${words}).`);
	}
	assertPositiveFinite(wordsPerMinute, 'Words per minute');
	return (words / wordsPerMinute) * 60;
}

/** One timed reading aloud: how many spoken words it had and how long the host took. */
export interface PaceSample {
	words: number;
	recordedSeconds: number;
}

/** A host's pace measured from readings, or the fallback when there is nothing usable or plausible. */
export interface CalibratedPace {
	wordsPerMinute: number;
	/** How many samples were used (after dropping short or broken ones). */
	basedOn: number;
	/** False when `wordsPerMinute` is the fallback: nothing usable, or a refused measurement. */
	calibrated: boolean;
	/** The measured pace, when there was anything usable to measure (even if refused). */
	measuredWordsPerMinute: number | null;
	/** True when the measurement lies outside CALIBRATED_PACE_RANGE: not a speaking pace. */
	refused: boolean;
}

/**
 * Measures a pace as total words ÷ total minutes over usable samples; a result outside
 * CALIBRATED_PACE_RANGE is refused (the fallback is kept, `refused` says why), never clamped.
 *
 * Pooled rather than a mean of per-sample rates: the pooled rate is the one that reproduces the
 * total time from the total words, and it weights each sample by its length.
 */
export function calibratePace(
	samples: readonly PaceSample[],
	fallback: number = DEFAULT_WORDS_PER_MINUTE
): CalibratedPace {
	assertPositiveFinite(fallback, 'Fallback words per minute');
	const usable = samples.filter(
		(sample) =>
			Number.isFinite(sample.words) &&
			Number.isFinite(sample.recordedSeconds) &&
			sample.recordedSeconds >= CALIBRATION_MIN_SECONDS &&
			sample.words >= CALIBRATION_MIN_WORDS
	);
	const uncalibrated = { wordsPerMinute: fallback, basedOn: 0, calibrated: false };
	if (usable.length === 0) return { ...uncalibrated, measuredWordsPerMinute: null, refused: false };
	const totalWords = usable.reduce((sum, sample) => sum + sample.words, 0);
	const totalMinutes = usable.reduce((sum, sample) => sum + sample.recordedSeconds, 0) / 60;
	const measured = totalWords / totalMinutes;
	if (measured < CALIBRATED_PACE_RANGE.minimum || measured > CALIBRATED_PACE_RANGE.maximum) {
		return { ...uncalibrated, measuredWordsPerMinute: measured, refused: true };
	}
	return {
		wordsPerMinute: measured,
		basedOn: usable.length,
		calibrated: true,
		measuredWordsPerMinute: measured,
		refused: false
	};
}

/** How an estimate compares with a target runtime. */
export interface RuntimeBalance {
	/** Estimated minus target: positive means running long. */
	deltaSeconds: number;
	state: 'under' | 'on' | 'over';
	/** Estimated ÷ target: 1 is exactly on target, 1.2 is 20% long. */
	fraction: number;
}

/** Our own on-time window for a target: the larger of ±5% and ±10 s. */
export function runtimeToleranceSeconds(targetSeconds: number): number {
	assertPositiveFinite(targetSeconds, 'Target runtime in seconds');
	return Math.max(targetSeconds * RUNTIME_TOLERANCE_FRACTION, RUNTIME_TOLERANCE_MIN_SECONDS);
}

/** Compares an estimated runtime with a target; within the tolerance (boundary included) is "on". */
export function runtimeBalance(estimatedSeconds: number, targetSeconds: number): RuntimeBalance {
	if (!Number.isFinite(estimatedSeconds) || estimatedSeconds < 0) {
		throw new RangeError(`Estimated runtime must be 0 seconds or more (got ${estimatedSeconds}).`);
	}
	const tolerance = runtimeToleranceSeconds(targetSeconds);
	const deltaSeconds = estimatedSeconds - targetSeconds;
	const state = deltaSeconds > tolerance ? 'over' : deltaSeconds < -tolerance ? 'under' : 'on';
	return { deltaSeconds, state, fraction: estimatedSeconds / targetSeconds };
}
