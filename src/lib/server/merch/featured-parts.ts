/**
 * Featured parts: every catalogue part linked on an episode's segment notes, in order of first
 * appearance in the cut, with each appearance time, and what needs fixing before the picture is
 * locked:
 * - a part discontinued or out of stock (viewers would follow a link to a part they can't buy);
 * - a part on a note with no program time yet (the description can't say when it is on screen);
 * - a part named in the script (its SKU, or its exact name, as whole words, ignoring case and
 *   the punctuation around them) but never linked on a note (a list only; it doesn't hold up the lock).
 */
import { sql, type Expression } from 'kysely';
import { db } from '../db';
import { episodeInChannel, episodeNotFound, type Executor } from '../episodes/episodes';
import { isUuid } from '../auth/identity';
import {
	clockOrUsual,
	formatClock,
	framesToSeconds,
	type FrameRate,
	type ProgrammeClock
} from '$lib/timecode';
import { clockOfEpisode } from '../episodes/programme-timecode';
import type { Role } from '$lib/roles';

export interface FeaturedAppearance {
	noteId: string;
	programFrame: number;
	timecode: string;
	/** M:SS (H:MM:SS past an hour), cut off to the second as a description shows it. */
	clock: string;
}

export interface FeaturedPart {
	partId: string;
	sku: string;
	name: string;
	brand: string;
	category: string;
	status: 'active' | 'discontinued' | 'out_of_stock';
	storeUrl: string;
	priceCents: number;
	currency: string;
	/** First frame in the cut it is on screen; null when none of its notes is placed. */
	firstFrame: number | null;
	appearances: FeaturedAppearance[];
	/** Notes showing it that have no program time yet. */
	unplaced: { noteId: string; text: string }[];
	linkCode: string | null;
}

export type FeaturedWarningKind =
	'discontinued' | 'out-of-stock' | 'no-program-time' | 'named-not-linked';

export interface FeaturedWarning {
	kind: FeaturedWarningKind;
	partId: string;
	sku: string;
	message: string;
	/** Whether this one holds up the edit → locked gate. */
	blocksLock: boolean;
}

export interface FeaturedParts {
	episode: { id: string; title: string; slug: string; frameRate: FrameRate };
	parts: FeaturedPart[];
	warnings: FeaturedWarning[];
}

/** The columns of a featured-part row (a note's part link, the part, its tracked link). */
const FEATURED_COLUMNS = [
	'part.id as partId',
	'part.sku',
	'part.name',
	'part.brand',
	'part.category',
	'part.status',
	'part.storeUrl',
	'part.priceCents',
	'part.currency',
	'segmentNote.id as noteId',
	'segmentNote.programFrame',
	'segmentNote.text',
	'trackedLink.code as linkCode'
] as const;

/**
 * Every (note, part) link of an episode with the part and its tracked link, in no order. The
 * publish kit reads it as a subquery, naming the episode by a reference to its own row.
 */
export function featuredLinks(executor: Executor, episodeId: string | Expression<string>) {
	return executor
		.selectFrom('segmentNotePart')
		.innerJoin('segmentNote', 'segmentNote.id', 'segmentNotePart.noteId')
		.innerJoin('part', 'part.id', 'segmentNotePart.partId')
		.leftJoin('trackedLink', (join) =>
			join
				.onRef('trackedLink.partId', '=', 'part.id')
				.onRef('trackedLink.episodeId', '=', 'segmentNote.episodeId')
		)
		.select(FEATURED_COLUMNS)
		.where('segmentNote.episodeId', '=', episodeId);
}

/** One row per (note, part) link of the episode, in program-time order. */
function featuredRows(executor: Executor, episodeId: string) {
	return featuredLinks(executor, episodeId)
		.orderBy(sql`segment_note.program_frame ASC NULLS LAST`)
		.orderBy('segmentNote.createdAt')
		.execute();
}

type FeaturedRow = Awaited<ReturnType<typeof featuredRows>>[number];

export const clockAt = (frame: number, rate: FrameRate) =>
	formatClock(framesToSeconds(frame, rate));

/** Groups (note, part) rows into parts ordered by first appearance; parts never placed come last, by SKU. */
export function groupFeatured(
	rows: readonly FeaturedRow[],
	clockOrRate: ProgrammeClock | FrameRate
): FeaturedPart[] {
	// Appearances carry the episode's programme timecode; a bare rate means its usual form from 0.
	const programme = clockOrUsual(clockOrRate);
	const rate = programme.rate;
	const parts = new Map<string, FeaturedPart>();
	for (const row of rows) {
		let part = parts.get(row.partId);
		if (!part) {
			part = {
				partId: row.partId,
				sku: row.sku,
				name: row.name,
				brand: row.brand,
				category: row.category,
				status: row.status,
				storeUrl: row.storeUrl,
				priceCents: row.priceCents,
				currency: row.currency,
				firstFrame: null,
				appearances: [],
				unplaced: [],
				linkCode: row.linkCode
			};
			parts.set(row.partId, part);
		}
		if (row.programFrame === null) part.unplaced.push({ noteId: row.noteId, text: row.text });
		else {
			part.appearances.push({
				noteId: row.noteId,
				programFrame: row.programFrame,
				timecode: programme.format(row.programFrame),
				clock: clockAt(row.programFrame, rate)
			});
			part.firstFrame =
				part.firstFrame === null ? row.programFrame : Math.min(part.firstFrame, row.programFrame);
		}
	}
	for (const part of parts.values())
		part.appearances.sort((a, b) => a.programFrame - b.programFrame);
	return [...parts.values()].sort((a, b) => {
		if (a.firstFrame === null || b.firstFrame === null)
			return a.firstFrame === b.firstFrame
				? a.sku.localeCompare(b.sku)
				: a.firstFrame === null
					? 1
					: -1;
		return a.firstFrame - b.firstFrame || a.sku.localeCompare(b.sku);
	});
}

const shortText = (text: string) => {
	const line = text.replace(/\s+/g, ' ').trim();
	return line.length > 50 ? `${line.slice(0, 49)}…` : line;
};

const atTimes = (part: FeaturedPart) =>
	part.appearances.length
		? ` (on screen at ${part.appearances.map((a) => a.clock).join(', ')})`
		: '';

/** The warnings that hold up the lock, in the crew's words. */
export function lockWarnings(parts: readonly FeaturedPart[]): FeaturedWarning[] {
	const warnings: FeaturedWarning[] = [];
	for (const part of parts) {
		const label = `${part.sku} “${part.name}”`;
		if (part.status === 'discontinued') {
			warnings.push({
				kind: 'discontinued',
				partId: part.partId,
				sku: part.sku,
				blocksLock: true,
				message: `${label} is discontinued${atTimes(part)}: link a current catalogue part on its notes instead.`
			});
		} else if (part.status === 'out_of_stock') {
			warnings.push({
				kind: 'out-of-stock',
				partId: part.partId,
				sku: part.sku,
				blocksLock: true,
				message: `${label} is out of stock${atTimes(part)}: restock it or link an active part instead.`
			});
		}
		for (const note of part.unplaced) {
			warnings.push({
				kind: 'no-program-time',
				partId: part.partId,
				sku: part.sku,
				blocksLock: true,
				message: `${label} is on a note with no program time (“${shortText(note.text)}”): the editor places the note in the cut.`
			});
		}
	}
	return warnings;
}

/** Sentence punctuation and Markdown emphasis around a word, which a part number or name doesn't include. */
const LEADING = /^[("'“‘*_[]+/u;
const TRAILING = /[.,;:!?)"'”’*_\]]+$/u;
const MAX_PHRASE_WORDS = 12;

/** The script's words, lower-cased, split at white space, each with its punctuation-trimmed forms. */
function scriptWords(text: string) {
	return text
		.toLowerCase()
		.split(/\s+/u)
		.filter(Boolean)
		.map((word) => {
			const led = word.replace(LEADING, '');
			// A one-word run loses punctuation at both ends; a longer run's first word only in front.
			return { word, led, trimmed: led.replace(TRAILING, '') };
		});
}

/**
 * Every run of 1 to `maxWords` consecutive words of the text, lower-cased, joined by one space,
 * with the punctuation around the run taken off (and also as written). A part is "named" when its
 * SKU or its whole name is one of these: whole words only, so "KBS-LB-300" is not named by
 * "KBS-LB-300T", and case and line breaks don't matter.
 *
 * `startsWith`, when given, keeps only the runs whose first word (the text before the first
 * space, as the run is written) is in it: a run can only equal a name or SKU that begins with
 * that word.
 */
export function scriptPhrases(
	text: string,
	maxWords = MAX_PHRASE_WORDS,
	startsWith?: ReadonlySet<string>
): string[] {
	const words = scriptWords(text);
	const phrases = new Set<string>();
	for (let start = 0; start < words.length; start++) {
		const first = words[start];
		const keepRaw = !startsWith || startsWith.has(first.word);
		const keepLed = !startsWith || startsWith.has(first.led);
		if (!keepRaw && !keepLed && !startsWith?.has(first.trimmed)) continue;
		// One word: as written, and with punctuation off both ends.
		if (keepRaw) phrases.add(first.word);
		if (first.trimmed && (!startsWith || startsWith.has(first.trimmed))) phrases.add(first.trimmed);
		// Longer runs, grown one word at a time: as written, and with the first word's leading and
		// the last word's trailing punctuation off.
		let written = first.word;
		let led = first.led;
		const end = Math.min(words.length, start + maxWords);
		for (let next = start + 1; next < end; next++) {
			const { word } = words[next];
			if (keepRaw) phrases.add(`${written} ${word}`);
			if (keepLed) {
				const trimmed = `${led} ${word.replace(TRAILING, '')}`;
				if (trimmed) phrases.add(trimmed);
			}
			written = `${written} ${word}`;
			led = `${led} ${word}`;
		}
	}
	return [...phrases];
}

/** Every word a run of the script can begin with (see scriptPhrases), once each. */
function firstWords(text: string): string[] {
	const words = new Set<string>();
	for (const { word, led, trimmed } of scriptWords(text)) {
		words.add(word);
		words.add(led);
		if (trimmed) words.add(trimmed);
	}
	return [...words];
}

/**
 * Catalogue parts whose SKU or exact name is in the episode's script text (see scriptPhrases), in
 * two queries whatever the script's length or the catalogue's size: which of its
 * words begin a SKU or a name of the channel (one probe of the byte-ordered lower(sku) and
 * lower(name) indexes per distinct word, migration 2026-12-04-10); then only the phrases that
 * start with such a word, one index probe each. Most words of a script begin no part at all, so
 * the phrases looked up are a few dozen instead of twelve per word.
 */
async function partsNamedInScript(executor: Executor, channelId: string, text: string) {
	const candidates = firstWords(text);
	if (candidates.length === 0) return [];
	// A SKU or name begins with the word when it is the word, or the word and a space: in byte
	// order that is the range [word, word || '!') (a character below '!' after the word only
	// widens the set, never narrows it).
	const starting = await sql<{ word: string }>`
		WITH candidate AS MATERIALIZED (SELECT DISTINCT unnest(${candidates}::text[]) AS word)
		SELECT candidate.word FROM candidate
		WHERE EXISTS (
			SELECT FROM part WHERE part.channel_id = ${channelId}
			AND (lower(part.sku) COLLATE "C") >= candidate.word
			AND (lower(part.sku) COLLATE "C") < candidate.word || '!'
		) OR EXISTS (
			SELECT FROM part WHERE part.channel_id = ${channelId}
			AND (lower(part.name) COLLATE "C") >= candidate.word
			AND (lower(part.name) COLLATE "C") < candidate.word || '!'
		)`.execute(executor);
	if (starting.rows.length === 0) return [];
	const phrases = scriptPhrases(
		text,
		MAX_PHRASE_WORDS,
		new Set(starting.rows.map((row) => row.word))
	);
	if (phrases.length === 0) return [];
	// Each phrase is one probe of each index (a LATERAL subquery per phrase; a plain join or = ANY
	// lets the planner read every part and compute lower() on each instead).
	const named = await sql<{ id: string; sku: string; name: string }>`
		WITH phrase AS MATERIALIZED (SELECT unnest(${phrases}::text[]) AS text)
		SELECT DISTINCT found.id, found.sku, found.name FROM phrase
		CROSS JOIN LATERAL (
			SELECT part.id, part.sku, part.name FROM part
			WHERE part.channel_id = ${channelId} AND (lower(part.sku) COLLATE "C") = phrase.text
			UNION ALL
			SELECT part.id, part.sku, part.name FROM part
			WHERE part.channel_id = ${channelId} AND (lower(part.name) COLLATE "C") = phrase.text
		) AS found
		ORDER BY found.sku`.execute(executor);
	return named.rows;
}

/** The featured parts list and its warnings for one episode of the channel (404 otherwise). */
export async function featuredPartsFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<FeaturedParts> {
	if (!isUuid(episodeId)) throw episodeNotFound();
	// The episode and its script text (every segment's, as one text) in one query.
	const episode = await executor
		.selectFrom('episode')
		.select((eb) => [
			'episode.id',
			'episode.title',
			'episode.slug',
			'episode.frameRate',
			'episode.timecodeDropFrame',
			'episode.timecodeStart',
			eb
				.selectFrom('segmentScript')
				.innerJoin('segment', 'segment.id', 'segmentScript.segmentId')
				.select(
					sql<string | null>`string_agg(segment_script.body, E'\n' ORDER BY segment.position)`.as(
						'text'
					)
				)
				.whereRef('segment.episodeId', '=', 'episode.id')
				.as('scriptText')
		])
		.where('episode.id', '=', episodeId)
		.where('episode.channelId', '=', channelId)
		.executeTakeFirst();
	if (!episode) throw episodeNotFound();
	const rate = episode.frameRate;
	const [rows, named] = await Promise.all([
		featuredRows(executor, episode.id),
		partsNamedInScript(executor, channelId, episode.scriptText ?? '')
	]);
	const parts = groupFeatured(rows, clockOfEpisode(episode));
	const featured = new Set(parts.map((part) => part.partId));
	const warnings = lockWarnings(parts);
	for (const part of named) {
		if (featured.has(part.id)) continue;
		warnings.push({
			kind: 'named-not-linked',
			partId: part.id,
			sku: part.sku,
			blocksLock: false,
			message: `${part.sku} “${part.name}” is named in the script but no note links it: link it where it is on screen, or check the script.`
		});
	}
	return {
		episode: { id: episode.id, title: episode.title, slug: episode.slug, frameRate: rate },
		parts,
		warnings
	};
}

/**
 * For the edit → locked gate: why the featured parts aren't ready, in plain words ([] when they
 * are): every featured part is an active catalogue part and every note showing one has a program
 * time. 404 for an episode of another channel.
 */
export async function featuredPartProblemsFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<{ message: string; fixedBy: Role }[]> {
	const episode = await episodeInChannel(channelId, episodeId, executor);
	const parts = groupFeatured(await featuredRows(executor, episode.id), episode.frameRate);
	// A note without a program time is the editor's to place; a part that isn't active is merch's to replace.
	return lockWarnings(parts).map((warning) => ({
		message: warning.message,
		fixedBy: warning.kind === 'no-program-time' ? 'editor' : 'merch'
	}));
}
