/**
 * Segment notes: a moment of the episode and what is on screen then. The camera operator writes
 * them while logging takes (the text, the segment, the take and its source timecode); the editor
 * places or corrects their program time in the cut; the merch team links the featured parts, and
 * may start a note (text, segment, parts) for a part it spots. The producer may do all three;
 * nobody else changes notes. Each change names the version it read.
 *
 * The notes page reads them through notes-page.ts; notes-placement.ts reads and checks where a
 * note sits (segment, take, source and program time).
 */
import { error } from '@sveltejs/kit';
import { sql } from 'kysely';
import { db } from '../db';
import type { Role } from '../db/types';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import { type Actor, type Executor } from '../episodes/episodes';
import { clockOfEpisode } from '../episodes/programme-timecode';
import { episodeOpenFor } from '../episodes/stage-locks';
import { ensureTrackedLinks } from './tracked-links';
import { viewOf, type NoteView } from './notes-page';
import { checkPlacement, programFrameOf, sourceTimeOf } from './notes-placement';
import type { FrameRate } from '$lib/timecode';
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
	channelId: string,
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
	await ensureTrackedLinks(channelId, episodeId, partIds, trx);
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
		const episode = await episodeOpenFor(trx, channelId, 'notes', { episodeId });
		const rate = episode.frameRate;
		const placement = await checkPlacement(trx, episode.id, rate, {
			segmentId: input.segmentId ?? null,
			takeId: input.takeId ?? null,
			source: sourceTimeOf(input) ?? null
		});
		const programFrame =
			programFrameOf(input, clockOfEpisode(episode), episode.cutDurationFrames) ?? null;
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
		await replaceParts(trx, channelId, episode.id, note.id, partIds);
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
			'episode.timecodeDropFrame',
			'episode.timecodeStart',
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
		await episodeOpenFor(trx, channelId, 'notes', { noteId });
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
		const programFrame = programFrameOf(input, clockOfEpisode(note), note.cutDurationFrames);
		if (programFrame !== undefined) changes.programFrame = programFrame;
		if (input.partIds !== undefined)
			await replaceParts(
				trx,
				channelId,
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
		await episodeOpenFor(trx, channelId, 'notes', { noteId });
		const note = await scopedNote(trx, channelId, noteId);
		if (version !== undefined && note.version !== version) return refuseStale(trx, note);
		const removed = await viewOf(trx, note.episodeId, note.id, note.rate);
		await trx.deleteFrom('segmentNote').where('id', '=', note.id).execute();
		return removed;
	});
}
