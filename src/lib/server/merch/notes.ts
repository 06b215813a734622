/**
 * Segment notes: a moment of the episode and what is on screen then. The camera operator writes
 * them while logging takes (the text, the segment, the take and its source timecode); the editor
 * places or corrects their program time in the cut; the merch team links the featured parts, and
 * may start a note (text, segment, parts) for a part it spots. The producer may do all three;
 * nobody else changes notes. Each change names the version it read.
 *
 * Times: program time is a frame of the cut at the episode's rate, typed as timecode (read
 * drop-frame at 29.97 and 59.94, as the pages show it) or as a clock time (the first frame at or
 * after it, so a timestamp copied into a description never lands before the moment). Source time
 * is the take's camera timecode at the same rate, read and shown in the take's own form (drop-frame
 * when the take was logged with ";"), whichever separator the note's time is typed with.
 */
import { error } from '@sveltejs/kit';
import { sql } from 'kysely';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import { db } from '../db';
import type { Role } from '../db/types';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import { episodeInChannel, type Actor, type Executor } from '../episodes/episodes';
import { ensureTrackedLinks } from './tracked-links';
import { frameFromTyped } from '../edit/typed-time';
import { chapterStartFromText } from '$lib/chapters';
import {
	TimecodeError,
	defaultDropFrame,
	formatClock,
	formatTimecode,
	framesToSeconds,
	parseTimecodeInForm,
	type FrameRate
} from '$lib/timecode';
import type { NoteCreate, NoteUpdate } from '$lib/schemas/parts';

export const noteNotFound = () => notFound('That note');

/** What a person's roles let them change on a note. */
export interface NoteRights {
	/** Write and remove notes: text, segment, take, source time (camera). */
	write: boolean;
	/** Place or correct the program time (editor). */
	place: boolean;
	/** Link and unlink featured parts (merch). */
	link: boolean;
	/** Start a note with its text, segment and parts (camera or merch; the take stays camera's). */
	start: boolean;
}

export function noteRightsFor(roles: readonly Role[]): NoteRights {
	const producer = roles.includes('producer');
	return {
		write: producer || roles.includes('camera'),
		place: producer || roles.includes('editor'),
		link: producer || roles.includes('merch'),
		start: producer || roles.includes('camera') || roles.includes('merch')
	};
}

/**
 * Refuses (403) a change that touches fields the caller's roles don't cover, naming who does it.
 * Checked before anything is read, like requireRole.
 */
export function assertNoteRights(
	roles: readonly Role[],
	input: Partial<NoteUpdate>,
	creating = false
): void {
	const rights = noteRightsFor(roles);
	const refusals: string[] = [];
	// Whoever may start a note gives it its text and segment; the take and source time stay the
	// camera operator's, and afterwards the text and segment are too.
	const touchesWriting = (
		creating
			? ['takeId', 'sourceTime', 'sourceFrame']
			: ['text', 'segmentId', 'takeId', 'sourceTime', 'sourceFrame']
	).some(
		(field) =>
			input[field as keyof NoteUpdate] !== undefined &&
			(!creating || input[field as keyof NoteUpdate] !== null)
	);
	if (creating && !rights.start)
		refusals.push('the camera operator or the merch team starts notes');
	else if (touchesWriting && !rights.write)
		refusals.push('the camera operator writes notes (text, segment, take and source time)');
	if ((input.programTime !== undefined || input.programFrame !== undefined) && !rights.place)
		refusals.push('the editor places their program time');
	if (input.partIds !== undefined && !rights.link)
		refusals.push('the merch team links their parts');
	if (refusals.length > 0)
		error(403, `Not with your roles: ${refusals.join('; ')}. The producer may do all of it.`);
}

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
	/** Timecode at the episode's rate (drop-frame at 29.97 and 59.94). */
	programTimecode: string | null;
	/** M:SS as a description shows it. */
	programClock: string | null;
	takeId: string | null;
	takeClip: string | null;
	sourceFrame: number | null;
	/** The source frame as the take's camera showed it (drop-frame when the take was logged so). */
	sourceTimecode: string | null;
	text: string;
	authorName: string | null;
	parts: NotePart[];
	version: number;
}

export interface NotesPage {
	episode: {
		id: string;
		title: string;
		slug: string;
		stage: string;
		frameRate: FrameRate;
		dropFrame: boolean;
		cutDurationFrames: number | null;
		cutTimecode: string | null;
	};
	segments: { id: string; position: number; title: string }[];
	takes: {
		id: string;
		clipName: string;
		segmentId: string;
		shot: string;
		good: boolean;
		sourceIn: string;
		sourceOut: string;
	}[];
	notes: NoteView[];
}

/** The notes of one episode, with their parts, in program-time order (unplaced ones last). */
function notesQuery(executor: Executor, episodeId: string) {
	return executor
		.selectFrom('segmentNote')
		.leftJoin('segment', 'segment.id', 'segmentNote.segmentId')
		.leftJoin('take', 'take.id', 'segmentNote.takeId')
		.leftJoin('person', 'person.id', 'segmentNote.authorId')
		.select((eb) => [
			'segmentNote.id',
			'segmentNote.segmentId',
			'segment.title as segmentTitle',
			'segment.position as segmentPosition',
			'segmentNote.programFrame',
			'segmentNote.takeId',
			'take.clipName as takeClip',
			'take.sourceDropFrame',
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
		.where('segmentNote.episodeId', '=', episodeId)
		.orderBy(sql`segment_note.program_frame ASC NULLS LAST`)
		.orderBy(sql`segment.position ASC NULLS LAST`)
		.orderBy('segmentNote.createdAt')
		.orderBy('segmentNote.id');
}

type NoteRow = Awaited<ReturnType<ReturnType<typeof notesQuery>['execute']>>[number];

function toView(row: NoteRow, rate: FrameRate): NoteView {
	const { sourceDropFrame, ...note } = row;
	return {
		...note,
		programTimecode: row.programFrame === null ? null : formatTimecode(row.programFrame, rate),
		programClock:
			row.programFrame === null ? null : formatClock(framesToSeconds(row.programFrame, rate)),
		sourceTimecode:
			row.sourceFrame === null
				? null
				: formatTimecode(row.sourceFrame, rate, { dropFrame: sourceDropFrame ?? false }),
		parts: row.parts as NotePart[]
	};
}

/** Everything the notes page shows: the episode, its segments and takes to pick from, and its notes. */
export async function notesPageFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<NotesPage> {
	const episode = await episodeInChannel(executor, channelId, episodeId);
	const rate = episode.frameRate;
	const [segments, takes, notes] = await Promise.all([
		executor
			.selectFrom('segment')
			.select(['id', 'position', 'title'])
			.where('episodeId', '=', episode.id)
			.orderBy('position')
			.execute(),
		executor
			.selectFrom('take')
			.innerJoin('shot', 'shot.id', 'take.shotId')
			.innerJoin('segment', 'segment.id', 'shot.segmentId')
			.select([
				'take.id',
				'take.clipName',
				'take.good',
				'take.sourceInFrames',
				'take.sourceOutFrames',
				'take.sourceDropFrame',
				'shot.what',
				'shot.segmentId'
			])
			.where('segment.episodeId', '=', episode.id)
			.orderBy('segment.position')
			.orderBy('shot.position')
			.orderBy('take.clipName')
			.execute(),
		notesQuery(executor, episode.id).execute()
	]);
	return {
		episode: {
			id: episode.id,
			title: episode.title,
			slug: episode.slug,
			stage: episode.stage,
			frameRate: rate,
			dropFrame: defaultDropFrame(rate),
			cutDurationFrames: episode.cutDurationFrames,
			cutTimecode:
				episode.cutDurationFrames === null ? null : formatTimecode(episode.cutDurationFrames, rate)
		},
		segments,
		takes: takes.map((take) => ({
			id: take.id,
			clipName: take.clipName,
			segmentId: take.segmentId,
			shot: take.what,
			good: take.good,
			sourceIn: formatTimecode(take.sourceInFrames, rate, { dropFrame: take.sourceDropFrame }),
			sourceOut: formatTimecode(take.sourceOutFrames, rate, { dropFrame: take.sourceDropFrame })
		})),
		notes: notes.map((row) => toView(row, rate))
	};
}

/** Runs a parse of typed time; a typing mistake is a 400 in plain words on that field. */
function readTyped(field: string, parse: () => number): number {
	return frameFromTyped(field, parse);
}

/** The program frame the input names: undefined = unchanged, null = cleared. */
function programFrameOf(
	input: Partial<NoteUpdate>,
	rate: FrameRate,
	cutDurationFrames: number | null
): number | null | undefined {
	let frame: number | null | undefined = input.programFrame;
	if (input.programTime !== undefined) {
		frame =
			input.programTime === null || input.programTime === ''
				? null
				: readTyped('programTime', () => chapterStartFromText(input.programTime!, rate));
	}
	if (
		frame !== null &&
		frame !== undefined &&
		cutDurationFrames !== null &&
		frame >= cutDurationFrames
	) {
		const message = `${formatTimecode(frame, rate)} is past the end of the cut (${formatTimecode(cutDurationFrames, rate)}); place the note inside the cut.`;
		throw new DomainError(400, message, { programTime: [message] });
	}
	return frame;
}

/** A source time typed as text, read once the take (and so its timecode form) is known. */
type SourceTime = { text: string } | number | null;

/** The source time the input names: undefined = unchanged, null = cleared. */
function sourceTimeOf(input: Partial<NoteUpdate>): SourceTime | undefined {
	if (input.sourceTime !== undefined) {
		return input.sourceTime === null || input.sourceTime === '' ? null : { text: input.sourceTime };
	}
	return input.sourceFrame;
}

interface NoteSettings {
	segmentId: string | null;
	takeId: string | null;
	sourceFrame: number | null;
}

interface TakeSpan {
	clipName: string;
	sourceInFrames: number;
	sourceOutFrames: number;
	sourceDropFrame: boolean;
}

/** "B001_C007 runs 08:01:10;00–08:01:30;00" in the take's own timecode form. */
function takeRuns(take: TakeSpan, rate: FrameRate): string {
	const tc = (frames: number) => formatTimecode(frames, rate, { dropFrame: take.sourceDropFrame });
	return `${tc(take.sourceInFrames)}–${tc(take.sourceOutFrames)}`;
}

/** The frame a typed source time names, read in the take's form; a typing mistake names the take's range. */
function sourceFrameIn(take: TakeSpan, rate: FrameRate, source: SourceTime): number | null {
	if (source === null || typeof source === 'number') return source;
	try {
		return parseTimecodeInForm(source.text, rate, take.sourceDropFrame);
	} catch (failure) {
		if (!(failure instanceof TimecodeError)) throw failure;
		const message = `${failure.message} Take ${take.clipName} runs ${takeRuns(take, rate)}.`;
		throw new DomainError(400, message, { sourceTime: [message] });
	}
}

/**
 * Checks the segment and take belong to this episode and the source time falls inside the take;
 * a take without a segment puts the note in the take's segment.
 */
async function checkPlacement(
	executor: Executor,
	episodeId: string,
	rate: FrameRate,
	settings: { segmentId: string | null; takeId: string | null; source: SourceTime }
): Promise<NoteSettings> {
	let { segmentId } = settings;
	const { takeId, source } = settings;
	if (segmentId !== null) {
		const segment = isUuid(segmentId)
			? await executor
					.selectFrom('segment')
					.select('id')
					.where('id', '=', segmentId)
					.where('episodeId', '=', episodeId)
					.executeTakeFirst()
			: undefined;
		if (!segment)
			throw new DomainError(
				400,
				'That segment is not in this episode’s rundown; pick one from the list.',
				{ segmentId: ['That segment is not in this episode’s rundown.'] }
			);
	}
	if (takeId === null) {
		if (source !== null)
			throw new DomainError(400, 'A source time belongs to a take: pick the take it is in.', {
				takeId: ['Pick the take the source time is in.']
			});
		return { segmentId, takeId, sourceFrame: null };
	}
	const take = await executor
		.selectFrom('take')
		.innerJoin('shot', 'shot.id', 'take.shotId')
		.innerJoin('segment', 'segment.id', 'shot.segmentId')
		.select([
			'take.clipName',
			'take.sourceInFrames',
			'take.sourceOutFrames',
			'take.sourceDropFrame',
			'shot.segmentId',
			'segment.position'
		])
		.where('take.id', '=', takeId)
		.where('segment.episodeId', '=', episodeId)
		.executeTakeFirst();
	if (!take)
		throw new DomainError(
			400,
			'That take is not in this episode’s shot list; pick one from the list.',
			{ takeId: ['That take is not in this episode’s shot list.'] }
		);
	if (segmentId === null) segmentId = take.segmentId;
	else if (segmentId !== take.segmentId) {
		const message = `Take ${take.clipName} was shot for segment ${take.position}; pick that segment or another take.`;
		throw new DomainError(400, message, { takeId: [message] });
	}
	const sourceFrame = sourceFrameIn(take, rate, source);
	if (
		sourceFrame !== null &&
		(sourceFrame < take.sourceInFrames || sourceFrame > take.sourceOutFrames)
	) {
		const shown = formatTimecode(sourceFrame, rate, { dropFrame: take.sourceDropFrame });
		const message = `${shown} is outside take ${take.clipName} (${takeRuns(take, rate)}); type a source time inside the take.`;
		throw new DomainError(400, message, { sourceTime: [message] });
	}
	return { segmentId, takeId, sourceFrame };
}

/** The part ids, checked to be in this channel's catalogue. */
async function checkParts(
	executor: Executor,
	channelId: string,
	partIds: readonly string[]
): Promise<string[]> {
	const unique = [...new Set(partIds)];
	if (unique.length === 0) return [];
	const found = await executor
		.selectFrom('part')
		.select('id')
		.where('channelId', '=', channelId)
		.where('id', 'in', unique)
		.execute();
	if (found.length !== unique.length) {
		throw new DomainError(
			400,
			'One of those parts is not in this channel’s catalogue; pick parts from the search.',
			{ partIds: ['One of those parts is not in the catalogue.'] }
		);
	}
	return unique;
}

async function replaceParts(
	trx: Executor,
	episodeId: string,
	noteId: string,
	partIds: string[]
): Promise<void> {
	let unlink = trx.deleteFrom('segmentNotePart').where('noteId', '=', noteId);
	if (partIds.length > 0) unlink = unlink.where('partId', 'not in', partIds);
	await unlink.execute();
	if (partIds.length === 0) return;
	await trx
		.insertInto('segmentNotePart')
		.values(partIds.map((partId) => ({ noteId, partId })))
		.onConflict((conflict) => conflict.columns(['noteId', 'partId']).doNothing())
		.execute();
	// Each featured part gets its tracked link now, so the publish kit only reads.
	await ensureTrackedLinks(trx, episodeId, partIds);
}

async function viewOf(
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

/** Writes a new note; the fields each role may set are checked with assertNoteRights first. */
export async function createNote(
	channelId: string,
	actor: Actor,
	episodeId: string,
	input: NoteCreate
): Promise<NoteView> {
	assertNoteRights(actor.roles, input, true);
	return db.transaction().execute(async (trx) => {
		const episode = await episodeInChannel(trx, channelId, episodeId, { lock: true });
		const rate = episode.frameRate;
		const placement = await checkPlacement(trx, episode.id, rate, {
			segmentId: input.segmentId ?? null,
			takeId: input.takeId ?? null,
			source: sourceTimeOf(input) ?? null
		});
		const programFrame = programFrameOf(input, rate, episode.cutDurationFrames) ?? null;
		const partIds = await checkParts(trx, channelId, input.partIds ?? []);
		const note = await trx
			.insertInto('segmentNote')
			.values({
				episodeId: episode.id,
				...placement,
				programFrame,
				text: input.text,
				authorId: actor.id
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await replaceParts(trx, episode.id, note.id, partIds);
		return viewOf(trx, episode.id, note.id, rate);
	});
}

/** The note of this channel with its episode, locked for the rest of the transaction; 404 otherwise. */
async function scopedNote(trx: Executor, channelId: string, noteId: string) {
	if (!isUuid(noteId)) throw noteNotFound();
	const note = await trx
		.selectFrom('segmentNote')
		.innerJoin('episode', 'episode.id', 'segmentNote.episodeId')
		.select([
			'segmentNote.id',
			'segmentNote.episodeId',
			'segmentNote.segmentId',
			'segmentNote.takeId',
			'segmentNote.sourceFrame',
			'segmentNote.version',
			'episode.frameRate',
			'episode.cutDurationFrames'
		])
		.where('segmentNote.id', '=', noteId)
		.where('episode.channelId', '=', channelId)
		.forUpdate('segmentNote')
		.executeTakeFirst();
	if (!note) throw noteNotFound();
	return { ...note, rate: note.frameRate };
}

async function refuseStale(
	trx: Executor,
	note: { episodeId: string; id: string; rate: FrameRate }
): Promise<never> {
	const current = await viewOf(trx, note.episodeId, note.id, note.rate);
	throw new DomainError(
		409,
		'Someone changed this note since you opened it. Their version is shown; make your change again on top of it.',
		undefined,
		{ current }
	);
}

/** Changes a note: text, segment, take, source time, program time, parts; each only by the role that owns it. */
export async function updateNote(
	channelId: string,
	actor: Actor,
	noteId: string,
	input: NoteUpdate
): Promise<NoteView> {
	assertNoteRights(actor.roles, input);
	return db.transaction().execute(async (trx) => {
		const note = await scopedNote(trx, channelId, noteId);
		if (note.version !== input.version) return refuseStale(trx, note);
		const changes: Record<string, unknown> = {};
		if (input.text !== undefined) changes.text = input.text;
		const touchesPlacement =
			input.segmentId !== undefined ||
			input.takeId !== undefined ||
			input.sourceTime !== undefined ||
			input.sourceFrame !== undefined;
		if (touchesPlacement) {
			// A new take without a new source time drops the old one: it was a time in the old take.
			const takeChanged = input.takeId !== undefined && input.takeId !== note.takeId;
			const source = sourceTimeOf(input);
			Object.assign(
				changes,
				await checkPlacement(trx, note.episodeId, note.rate, {
					// A newly picked take decides the segment unless one is named with it.
					segmentId:
						input.segmentId !== undefined ? input.segmentId : input.takeId ? null : note.segmentId,
					takeId: input.takeId !== undefined ? input.takeId : note.takeId,
					source: source !== undefined ? source : takeChanged ? null : note.sourceFrame
				})
			);
		}
		const programFrame = programFrameOf(input, note.rate, note.cutDurationFrames);
		if (programFrame !== undefined) changes.programFrame = programFrame;
		if (input.partIds !== undefined)
			await replaceParts(
				trx,
				note.episodeId,
				note.id,
				await checkParts(trx, channelId, input.partIds)
			);
		await trx
			.updateTable('segmentNote')
			.set({ ...changes, version: sql<number>`version + 1`, updatedAt: sql<Date>`now()` })
			.where('id', '=', note.id)
			.execute();
		return viewOf(trx, note.episodeId, note.id, note.rate);
	});
}

/** Removes a note (camera or producer); `version` makes it conditional on nobody having changed it since. */
export async function deleteNote(
	channelId: string,
	actor: Actor,
	noteId: string,
	version: number | undefined
): Promise<NoteView> {
	if (!noteRightsFor(actor.roles).write)
		error(403, 'Not with your roles: the camera operator (or the producer) removes notes.');
	return db.transaction().execute(async (trx) => {
		const note = await scopedNote(trx, channelId, noteId);
		if (version !== undefined && note.version !== version) return refuseStale(trx, note);
		const removed = await viewOf(trx, note.episodeId, note.id, note.rate);
		await trx.deleteFrom('segmentNote').where('id', '=', note.id).execute();
		return removed;
	});
}
