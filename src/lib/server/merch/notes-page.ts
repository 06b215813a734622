/**
 * The notes page's read model: an episode's notes with their parts and takes, in program-time
 * order, and the segments a note can be put in (at most MAX_SEGMENTS_PER_EPISODE); times shown at
 * the episode's rate. Takes to pick from are fetched on demand (`shoot/take-picker.ts`), never all.
 */
import { sql } from 'kysely';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import { db } from '../db';
import { episodeInChannel, type EpisodeHeading, type Executor } from '../episodes/episodes';
import { clockOfEpisode } from '../episodes/programme-timecode';
import { formatClock, formatTimecode, framesToSeconds, type FrameRate } from '$lib/timecode';
import {
	keysetAfter,
	keysetOrderBy,
	keysetPage,
	keysetSelections,
	type SortKey
} from '../http/keyset';
import { DEFAULT_PAGE_SIZE, encodeCursor, type Cursor } from '$lib/schemas/paging';

export interface NotePart {
	id: string;
	sku: string;
	name: string;
	brand: string;
	status: string;
}

export interface NoteView {
	id: string;
	segmentId: string | null;
	segmentTitle: string | null;
	segmentPosition: number | null;
	programFrame: number | null;
	/** The episode's programme timecode (its form and start offset). */
	programTimecode: string | null;
	/** M:SS as a description shows it. */
	programClock: string | null;
	takeId: string | null;
	takeClip: string | null;
	/** The note's take's source in and out, in the take's own timecode form. */
	takeSourceIn: string | null;
	takeSourceOut: string | null;
	sourceFrame: number | null;
	/** The source frame as the take's camera showed it (drop-frame when the take was logged so). */
	sourceTimecode: string | null;
	text: string;
	authorName: string | null;
	parts: NotePart[];
	version: number;
}

export interface NotesPage {
	episode: EpisodeHeading & {
		cutDurationFrames: number | null;
		cutTimecode: string | null;
	};
	segments: { id: string; position: number; title: string }[];
	/** One page of the notes, in program-time order. */
	notes: NoteView[];
	/** The cursor of the next page; null on the last. */
	next: string | null;
	/** Every note of the episode and those placed in the cut (not only this page's). */
	counts: { notes: number; placed: number };
}

/** The largest integer: a note without a program time (or segment) sorts after every placed one. */
const LAST = sql.lit(2147483647);

/**
 * Program-time order as keyset sort keys: program frame (unplaced last), segment position (no
 * segment last), when the note was written, its id.
 */
const noteOrder: SortKey[] = [
	{
		expression: sql`coalesce(segment_note.program_frame, ${LAST})`,
		direction: 'asc',
		kind: 'integer'
	},
	{ expression: sql`coalesce(segment.position, ${LAST})`, direction: 'asc', kind: 'integer' },
	{ expression: sql`segment_note.created_at`, direction: 'asc', kind: 'timestamp' },
	{ expression: sql`segment_note.id`, direction: 'asc', kind: 'uuid' }
];
const NOTE_ORDER = 'program:asc';

/** The notes of one episode, with their parts, in program-time order (unplaced ones last). */
function notesQuery(executor: Executor, episodeId: string) {
	return executor
		.selectFrom('segmentNote')
		.leftJoin('segment', 'segment.id', 'segmentNote.segmentId')
		.leftJoin('take', 'take.id', 'segmentNote.takeId')
		.leftJoin('person', 'person.id', 'segmentNote.authorId')
		.innerJoin('episode', 'episode.id', 'segmentNote.episodeId')
		.select((eb) => [
			// How the episode labels programme time, so every view of a note shows it the same way.
			'episode.frameRate as episodeFrameRate',
			'episode.timecodeDropFrame',
			'episode.timecodeStart',
			'segmentNote.id',
			'segmentNote.segmentId',
			'segment.title as segmentTitle',
			'segment.position as segmentPosition',
			'segmentNote.programFrame',
			'segmentNote.takeId',
			'take.clipName as takeClip',
			'take.sourceDropFrame',
			'take.sourceInFrames as takeSourceInFrames',
			'take.sourceOutFrames as takeSourceOutFrames',
			'segmentNote.sourceFrame',
			'segmentNote.text',
			'person.name as authorName',
			'segmentNote.version',
			jsonArrayFrom(
				eb
					.selectFrom('segmentNotePart')
					.innerJoin('part', 'part.id', 'segmentNotePart.partId')
					.select(['part.id', 'part.sku', 'part.name', 'part.brand', 'part.status'])
					.whereRef('segmentNotePart.noteId', '=', 'segmentNote.id')
					.orderBy('segmentNotePart.createdAt')
					.orderBy('part.sku')
			).as('parts')
		])
		.where('segmentNote.episodeId', '=', episodeId);
}

type NoteRow = Awaited<ReturnType<ReturnType<typeof notesQuery>['execute']>>[number];

function toView(row: NoteRow, rate: FrameRate): NoteView {
	const {
		sourceDropFrame,
		episodeFrameRate,
		timecodeDropFrame,
		timecodeStart,
		takeSourceInFrames,
		takeSourceOutFrames,
		...note
	} = row;
	const takeForm = { dropFrame: sourceDropFrame ?? false };
	const programme = clockOfEpisode({
		frameRate: episodeFrameRate,
		timecodeDropFrame,
		timecodeStart
	});
	return {
		...note,
		programTimecode: row.programFrame === null ? null : programme.format(row.programFrame),
		programClock:
			row.programFrame === null ? null : formatClock(framesToSeconds(row.programFrame, rate)),
		sourceTimecode:
			row.sourceFrame === null ? null : formatTimecode(row.sourceFrame, rate, takeForm),
		takeSourceIn:
			takeSourceInFrames === null ? null : formatTimecode(takeSourceInFrames, rate, takeForm),
		takeSourceOut:
			takeSourceOutFrames === null ? null : formatTimecode(takeSourceOutFrames, rate, takeForm),
		parts: row.parts as NotePart[]
	};
}

/**
 * Everything the notes page shows: the episode, its segments to pick from, and one page
 * of its notes (keyset-paged: `page.after` is the previous page's `next`) with the episode's counts.
 */
export async function notesPageFor(
	channelId: string,
	episodeId: string,
	page: { after?: Cursor; limit?: number } = {},
	executor: Executor = db
): Promise<NotesPage> {
	const limit = page.limit ?? DEFAULT_PAGE_SIZE;
	const episode = await episodeInChannel(channelId, episodeId, executor);
	const rate = episode.frameRate;
	const programme = clockOfEpisode(episode);
	const [segments, notes] = await Promise.all([
		executor
			.selectFrom('segment')
			.select(['id', 'position', 'title'])
			.where('episodeId', '=', episode.id)
			.orderBy('position')
			.execute(),
		notesQuery(executor, episode.id)
			// Uncorrelated, so PostgreSQL reads each count once for the whole page, in this query.
			.select((eb) => [
				eb
					.selectFrom('segmentNote as counted')
					.select((inner) => inner.fn.countAll<string>().as('count'))
					.where('counted.episodeId', '=', episode.id)
					.as('noteCount'),
				eb
					.selectFrom('segmentNote as counted')
					.select((inner) => inner.fn.countAll<string>().as('count'))
					.where('counted.episodeId', '=', episode.id)
					.where('counted.programFrame', 'is not', null)
					.as('placedCount')
			])
			.select(keysetSelections(noteOrder))
			.where(keysetAfter(NOTE_ORDER, noteOrder, page.after))
			.orderBy(keysetOrderBy(noteOrder))
			.limit(limit + 1)
			.execute()
	]);
	const notesPage = keysetPage(NOTE_ORDER, noteOrder, notes, limit);
	const first = notes[0];
	return {
		episode: {
			id: episode.id,
			title: episode.title,
			slug: episode.slug,
			stage: episode.stage,
			frameRate: rate,
			dropFrame: programme.dropFrame,
			timecodeStart: programme.startLabel,
			cutDurationFrames: episode.cutDurationFrames,
			// A length, so without the start offset.
			cutTimecode:
				episode.cutDurationFrames === null
					? null
					: programme.formatLength(episode.cutDurationFrames)
		},
		segments,
		notes: notesPage.items.map(({ noteCount: _notes, placedCount: _placed, ...row }) =>
			toView(row, rate)
		),
		next: notesPage.next,
		counts: { notes: Number(first?.noteCount ?? 0), placed: Number(first?.placedCount ?? 0) }
	};
}

/** One note as the page shows it (a write answers with it). */
export async function viewOf(
	executor: Executor,
	episodeId: string,
	noteId: string,
	rate: FrameRate
): Promise<NoteView> {
	const row = await notesQuery(executor, episodeId)
		.where('segmentNote.id', '=', noteId)
		.executeTakeFirstOrThrow();
	return toView(row, rate);
}

/**
 * The cursor of the notes page that starts with this note (the keys of the note just before it in
 * program-time order), or null when it is the first; for the redirect after writing a note, so
 * the page shown holds it however long the list is.
 */
export async function cursorBeforeNote(
	channelId: string,
	episodeId: string,
	noteId: string,
	executor: Executor = db
): Promise<string | null> {
	const keys = noteOrder.map((key) => key.expression);
	const { rows } = await sql<Record<string, string>>`
		WITH target AS (
			SELECT ${sql.join(keys.map((key, index) => sql`${key} AS ${sql.ref(`k${index}`)}`))}
			FROM segment_note LEFT JOIN segment ON segment.id = segment_note.segment_id
			WHERE segment_note.id = ${noteId} AND segment_note.episode_id = ${episodeId})
		SELECT ${sql.join(keys.map((key, index) => sql`(${key})::text AS ${sql.ref(`k${index}`)}`))}
		FROM segment_note
		LEFT JOIN segment ON segment.id = segment_note.segment_id
		INNER JOIN episode ON episode.id = segment_note.episode_id
		CROSS JOIN target
		WHERE segment_note.episode_id = ${episodeId} AND episode.channel_id = ${channelId}
			AND (${sql.join(keys)}) < (${sql.join(keys.map((_, index) => sql.ref(`target.k${index}`)))})
		ORDER BY ${sql.join(keys.map((key) => sql`${key} DESC`))}
		LIMIT 1`.execute(executor);
	const before = rows[0];
	return before ? encodeCursor(NOTE_ORDER, [before.k0, before.k1, before.k2, before.k3]) : null;
}
