/**
 * The edit: an episode's cut length and its chapter markers with their rules (files: chapter-download.ts).
 *
 * Every function takes the channel id and filters by it: an episode of another channel is "not
 * found". Chapter rules (src/lib/chapters/rules.ts) are reported, never refused, so the editor can
 * work through a half-finished list; only the exports refuse (422) a list that breaks them.
 * Chapters carry a version; a change that names a stale one answers 409 with the current row.
 */
import { sql } from 'kysely';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import { episodeNotFound, type EpisodeHeading, type Executor } from '../episodes/episodes';
import { episodeOpenFor } from '../episodes/stage-locks';
import { frameFromTyped } from './typed-time';
import { chapterStartFromText, validateChapters, type ChapterProblem } from '$lib/chapters';
import type { FrameRate, ProgrammeClock } from '$lib/timecode';
import { clockOfEpisode } from '../episodes/programme-timecode';
import type { ChapterCreate, ChapterUpdate, CutUpdate } from '$lib/schemas/edit';
import { editLocks, type Stage } from '$lib/stages';

export interface EditChapter {
	id: string;
	startFrame: number;
	/** The start as the episode's programme timecode (its form, plus its start offset). */
	startTimecode: string;
	title: string;
	url: string | null;
	partId: string | null;
	version: number;
}

/** A rule the chapter list breaks; `chapterId` null means the list as a whole. */
export interface EditProblem {
	chapterId: string | null;
	field: ChapterProblem['field'];
	message: string;
}

export interface EditState {
	episode: EpisodeHeading;
	cut: { durationFrames: number | null; timecode: string | null };
	/** In start order, the order the crew sees them in. */
	chapters: EditChapter[];
	problems: EditProblem[];
	/** Why the cut's length or the chapters can't change at this stage (null: they can). */
	locks: { cut: string | null; chapters: string | null };
}

const chapterNotFound = () => notFound('That chapter');

/**
 * One round trip: the episode and its chapters (in start order) as a JSON aggregate.
 * The export relies on this being a single query (see scripts/bench.ts).
 */
export function episodeWithChapters(channelId: string, episodeId: string, executor: Executor = db) {
	return executor
		.selectFrom('episode')
		.select((eb) => [
			'episode.id',
			'episode.title',
			'episode.slug',
			'episode.stage',
			'episode.frameRate',
			'episode.timecodeDropFrame',
			'episode.timecodeStart',
			'episode.cutDurationFrames',
			jsonArrayFrom(
				eb
					.selectFrom('chapter')
					.select([
						'chapter.id',
						'chapter.startFrame',
						'chapter.title',
						'chapter.url',
						'chapter.partId',
						'chapter.version'
					])
					.whereRef('chapter.episodeId', '=', 'episode.id')
					// Ties keep the order they were made in, so a duplicate start reads as "the later one".
					.orderBy('chapter.startFrame')
					.orderBy('chapter.createdAt')
					.orderBy('chapter.id')
			).as('chapters')
		])
		.where('episode.id', '=', episodeId)
		.where('episode.channelId', '=', channelId)
		.executeTakeFirst();
}

type EpisodeWithChapters = NonNullable<Awaited<ReturnType<typeof episodeWithChapters>>>;

function toEditChapter(
	row: {
		id: string;
		startFrame: number;
		title: string;
		url: string | null;
		partId: string | null;
		version: number;
	},
	clock: ProgrammeClock
): EditChapter {
	return {
		id: row.id,
		startFrame: row.startFrame,
		startTimecode: clock.format(row.startFrame),
		title: row.title,
		url: row.url,
		partId: row.partId,
		version: row.version
	};
}

/** validateChapters on the list in start order, with each problem tied to its chapter's id. */
export function problemsOf(
	chapters: readonly { id: string; startFrame: number; title: string; url: string | null }[],
	cutDurationFrames: number | null,
	rate: FrameRate
): EditProblem[] {
	return validateChapters([...chapters], cutDurationFrames ?? 0, rate).map((problem) => ({
		chapterId: problem.index === null ? null : (chapters[problem.index]?.id ?? null),
		field: problem.field,
		message: problem.message
	}));
}

function stateOf(row: EpisodeWithChapters): EditState {
	const rate = row.frameRate;
	const clock = clockOfEpisode(row);
	const chapters = row.chapters.map((chapter) => toEditChapter(chapter, clock));
	return {
		episode: {
			id: row.id,
			title: row.title,
			slug: row.slug,
			stage: row.stage,
			frameRate: rate,
			dropFrame: clock.dropFrame,
			timecodeStart: clock.startLabel
		},
		cut: {
			durationFrames: row.cutDurationFrames,
			// A length, so without the start offset.
			timecode: row.cutDurationFrames === null ? null : clock.formatLength(row.cutDurationFrames)
		},
		chapters,
		problems: problemsOf(row.chapters, row.cutDurationFrames, rate),
		locks: editLocks(row.stage as Stage)
	};
}

/** The episode's edit state, or null when the id names no episode of this channel. */
export async function findEditState(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<EditState | null> {
	if (!isUuid(episodeId)) return null;
	const row = await episodeWithChapters(channelId, episodeId, executor);
	return row ? stateOf(row) : null;
}

/** The episode's edit state; 404 when the id names no episode of this channel. */
export async function editStateFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<EditState> {
	const state = await findEditState(channelId, episodeId, executor);
	if (!state) throw episodeNotFound();
	return state;
}

/**
 * The chapter rule violations for a stage gate: null when the episode has no chapters yet,
 * otherwise validateChapters' messages ([] when the list is ready). 404 for another channel's episode.
 */
export async function chapterProblemsFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<string[] | null> {
	const state = await editStateFor(channelId, episodeId, executor);
	if (state.chapters.length === 0) return null;
	return state.problems.map((problem) => problem.message);
}

/**
 * The episode, locked for the change's transaction; 409 when its stage has fixed what the change
 * would touch (the one guard, episodes/stage-locks.ts).
 */
async function scopedEpisode(
	trx: Executor,
	channelId: string,
	episodeId: string,
	what: 'cut' | 'chapters'
) {
	const episode = await episodeOpenFor(trx, channelId, what, { episodeId });
	return { ...episode, rate: episode.frameRate, clock: clockOfEpisode(episode) };
}

function startFrameOf(
	input: { start?: string; startFrame?: number },
	clock: ProgrammeClock
): number | undefined {
	if (input.startFrame !== undefined) return input.startFrame;
	if (input.start !== undefined)
		return frameFromTyped('start', () => chapterStartFromText(input.start!, clock));
	return undefined;
}

/** Sets how long the cut runs, from timecode or clock text at the episode's rate. */
export async function setCutDuration(
	channelId: string,
	episodeId: string,
	input: CutUpdate
): Promise<EditState> {
	return db.transaction().execute((trx) => setCutDurationIn(trx, channelId, episodeId, input));
}

async function setCutDurationIn(
	trx: Executor,
	channelId: string,
	episodeId: string,
	input: CutUpdate
): Promise<EditState> {
	const episode = await scopedEpisode(trx, channelId, episodeId, 'cut');
	// A length, read in the episode's programme timecode form (drop-frame or not), without its start.
	const frames = frameFromTyped('duration', () => episode.clock.parseLength(input.duration));
	if (frames <= 0) {
		const message = `A cut has to run longer than 0 frames; type its length, e.g. 00:13:40${episode.clock.dropFrame ? ';' : ':'}00 or 13:40.`;
		throw new DomainError(400, message, { duration: [message] });
	}
	// Only the cut length changes: the episode's own version is left alone, so a producer editing the
	// episode's details at the same time is not told about a conflict that doesn't touch their fields.
	let update = trx
		.updateTable('episode')
		.set({ cutDurationFrames: frames })
		.where('id', '=', episode.id)
		.where('channelId', '=', channelId);
	if (input.expectedFrames !== undefined) {
		update = update.where(
			sql<boolean>`cut_duration_frames IS NOT DISTINCT FROM ${input.expectedFrames}`
		);
	}
	const result = await update.executeTakeFirst();
	if (Number(result.numUpdatedRows) !== 1) {
		const state = await editStateFor(channelId, episodeId, trx);
		throw new DomainError(
			409,
			`Someone set the cut's length to ${state.cut.timecode ?? 'nothing'} while you were working. Check it, then set yours again if it should change.`,
			undefined,
			{ current: state.cut, state }
		);
	}
	return editStateFor(channelId, episodeId, trx);
}

/** A chapter may name a part only from its own channel's catalogue. */
async function checkChapterPart(
	trx: Executor,
	channelId: string,
	partId: string | null | undefined
): Promise<void> {
	if (!partId) return;
	const part = await trx
		.selectFrom('part')
		.select('id')
		.where('id', '=', partId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!part) {
		const message =
			"That part isn't in this channel's catalogue. Pick one from Parts, or leave the chapter without a part.";
		throw new DomainError(400, message, { partId: [message] });
	}
}

/** Adds a chapter at a typed time or a frame; the rules it breaks come back in the state. */
export async function addChapter(
	channelId: string,
	episodeId: string,
	input: ChapterCreate
): Promise<{ chapter: EditChapter; state: EditState }> {
	return db.transaction().execute((trx) => addChapterIn(trx, channelId, episodeId, input));
}

async function addChapterIn(
	trx: Executor,
	channelId: string,
	episodeId: string,
	input: ChapterCreate
): Promise<{ chapter: EditChapter; state: EditState }> {
	const episode = await scopedEpisode(trx, channelId, episodeId, 'chapters');
	await checkChapterPart(trx, channelId, input.partId);
	const startFrame = startFrameOf(input, episode.clock)!;
	const row = await trx
		.insertInto('chapter')
		.values({
			episodeId: episode.id,
			startFrame,
			title: input.title,
			url: input.url ?? null,
			partId: input.partId ?? null
		})
		.returning(['id', 'startFrame', 'title', 'url', 'partId', 'version'])
		.executeTakeFirstOrThrow();
	return {
		chapter: toEditChapter(row, episode.clock),
		state: await editStateFor(channelId, episodeId, trx)
	};
}

async function chapterOf(trx: Executor, episodeId: string, chapterId: string) {
	return trx
		.selectFrom('chapter')
		.select(['id', 'startFrame', 'title', 'url', 'partId', 'version'])
		.where('id', '=', chapterId)
		.where('episodeId', '=', episodeId)
		.executeTakeFirst();
}

async function staleVersion(
	trx: Executor,
	channelId: string,
	episodeId: string,
	chapterId: string,
	clock: ProgrammeClock
): Promise<never> {
	const current = await chapterOf(trx, episodeId, chapterId);
	if (!current) throw chapterNotFound();
	throw new DomainError(
		409,
		`Someone changed chapter “${current.title}” while you were working on it. Their version is shown now; make your change again on top of it.`,
		undefined,
		{ current: toEditChapter(current, clock), state: await editStateFor(channelId, episodeId, trx) }
	);
}

/** Moves, renames or relinks a chapter; `version` must be the one the editor read (else 409). */
export async function updateChapter(
	channelId: string,
	episodeId: string,
	chapterId: string,
	input: ChapterUpdate
): Promise<{ chapter: EditChapter; state: EditState }> {
	return db
		.transaction()
		.execute((trx) => updateChapterIn(trx, channelId, episodeId, chapterId, input));
}

async function updateChapterIn(
	trx: Executor,
	channelId: string,
	episodeId: string,
	chapterId: string,
	input: ChapterUpdate
): Promise<{ chapter: EditChapter; state: EditState }> {
	const episode = await scopedEpisode(trx, channelId, episodeId, 'chapters');
	if (!isUuid(chapterId)) throw chapterNotFound();
	await checkChapterPart(trx, channelId, input.partId);
	const startFrame = startFrameOf(input, episode.clock);
	const row = await trx
		.updateTable('chapter')
		.set((eb) => ({
			...(startFrame !== undefined ? { startFrame } : {}),
			...(input.title !== undefined ? { title: input.title } : {}),
			...(input.url !== undefined ? { url: input.url } : {}),
			...(input.partId !== undefined ? { partId: input.partId } : {}),
			version: eb('version', '+', 1)
		}))
		.where('id', '=', chapterId)
		.where('episodeId', '=', episode.id)
		.where('version', '=', input.version)
		.returning(['id', 'startFrame', 'title', 'url', 'partId', 'version'])
		.executeTakeFirst();
	if (!row) return staleVersion(trx, channelId, episode.id, chapterId, episode.clock);
	return {
		chapter: toEditChapter(row, episode.clock),
		state: await editStateFor(channelId, episodeId, trx)
	};
}

/** Removes a chapter; with a version, only if nobody changed it since (else 409). */
export async function deleteChapter(
	channelId: string,
	episodeId: string,
	chapterId: string,
	version?: number
): Promise<{ removed: EditChapter; state: EditState }> {
	return db
		.transaction()
		.execute((trx) => deleteChapterIn(trx, channelId, episodeId, chapterId, version));
}

async function deleteChapterIn(
	trx: Executor,
	channelId: string,
	episodeId: string,
	chapterId: string,
	version?: number
): Promise<{ removed: EditChapter; state: EditState }> {
	const episode = await scopedEpisode(trx, channelId, episodeId, 'chapters');
	if (!isUuid(chapterId)) throw chapterNotFound();
	let removal = trx
		.deleteFrom('chapter')
		.where('id', '=', chapterId)
		.where('episodeId', '=', episode.id);
	if (version !== undefined) removal = removal.where('version', '=', version);
	const row = await removal
		.returning(['id', 'startFrame', 'title', 'url', 'partId', 'version'])
		.executeTakeFirst();
	if (!row) return staleVersion(trx, channelId, episode.id, chapterId, episode.clock);
	return {
		removed: toEditChapter(row, episode.clock),
		state: await editStateFor(channelId, episodeId, trx)
	};
}
