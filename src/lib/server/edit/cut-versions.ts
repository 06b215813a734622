/**
 * Versions of the cut: every cut upload becomes the episode's next numbered version (v1, v2, …) with
 * the editor's change note. The current version is always the newest: the edit timeline plays it,
 * comments go on it, and the producer approves it. Earlier versions stay playable on the screening
 * page. When a version arrives, the open comments move to it at the same programme time; the editor
 * may then confirm an offset (a shifted edit) and they move by it.
 */
import { sql } from 'kysely';
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import type { Executor } from '../episodes/episodes';
import { episodeOpenFor } from '../episodes/stage-locks';
import { clockOfEpisode } from '../episodes/programme-timecode';
import { frameFromTyped } from './typed-time';
import { APPROVAL_LABELS, carriedFrames, versionLabel, type CutApproval } from '$lib/cut-review';
import { secondsToFrames, TimecodeError, type ProgrammeClock } from '$lib/timecode';
import type { ApprovalInput } from '$lib/schemas/cut-review';
import { stageLock } from '$lib/stages';

export interface CutVersionView {
	id: string;
	number: number;
	label: string;
	changeNote: string;
	approval: CutApproval;
	approvalLabel: string;
	approvalNote: string | null;
	approvedByName: string | null;
	carryOffsetFrames: number;
	version: number;
	createdAt: string;
	footageId: string;
	fileName: string;
	/** Length in frames at the episode's rate, from the file's probe; null when not read. */
	lengthFrames: number | null;
	/** What a video element plays: the proxy once made, else the uploaded file. */
	playUrl: string;
	posterUrl: string | null;
	spriteUrl: string | null;
	sprite: unknown;
}

const versionNotFound = () => notFound('That version of the cut');

/**
 * Adds the next version for a finished cut upload and moves the episode's open comments to it;
 * answers whether it did. An upload created before picture lock whose last bytes arrive after it
 * stays a cut file of the episode (nothing sent is lost) but is no version: the lock fixes the
 * approved one.
 */
export async function addCutVersion(
	trx: Executor,
	episodeId: string,
	footageId: string,
	changeNote: string
): Promise<boolean> {
	// The episode row first, as every write does: numbers never collide and a stage move waits.
	const episode = await trx
		.selectFrom('episode')
		.select('stage')
		.where('id', '=', episodeId)
		.forUpdate()
		.executeTakeFirst();
	if (!episode || stageLock(episode.stage, 'cut')) return false;
	const added = await trx
		.insertInto('cutVersion')
		.values((eb) => ({
			episodeId,
			footageId,
			changeNote,
			number: eb
				.selectFrom('cutVersion')
				.select(sql<number>`coalesce(max(number), 0) + 1`.as('next'))
				.where('episodeId', '=', episodeId)
		}))
		.returning(['id', 'number'])
		.executeTakeFirstOrThrow();
	await sql`
		UPDATE cut_comment SET
			cut_version_id = ${added.id},
			carried_from = previous.number,
			source_start_frame = cut_comment.start_frame,
			source_end_frame = cut_comment.end_frame,
			version = cut_comment.version + 1
		FROM cut_version previous
		WHERE previous.id = cut_comment.cut_version_id
			AND cut_comment.episode_id = ${episodeId}
			AND cut_comment.state = 'open'
			AND cut_comment.cut_version_id <> ${added.id}
	`.execute(trx);
	return true;
}

/** Every version of the episode's cut, newest first, with what a player needs: one query. */
export function cutVersionsQuery(executor: Executor, channelId: string, episodeId: string) {
	return executor
		.selectFrom('cutVersion')
		.innerJoin('episode', 'episode.id', 'cutVersion.episodeId')
		.innerJoin('footage', 'footage.id', 'cutVersion.footageId')
		.leftJoin('person as approver', 'approver.id', 'cutVersion.approvedBy')
		.leftJoin('mediaOutput as proxy', (join) =>
			join
				.onRef('proxy.footageId', '=', 'footage.id')
				.on('proxy.kind', '=', 'proxy')
				.on('proxy.state', '=', 'done')
		)
		.leftJoin('mediaOutput as poster', (join) =>
			join
				.onRef('poster.footageId', '=', 'footage.id')
				.on('poster.kind', '=', 'poster')
				.on('poster.state', '=', 'done')
		)
		.leftJoin('mediaOutput as sprite', (join) =>
			join
				.onRef('sprite.footageId', '=', 'footage.id')
				.on('sprite.kind', '=', 'sprite')
				.on('sprite.state', '=', 'done')
		)
		.select([
			'cutVersion.id',
			'cutVersion.number',
			'cutVersion.changeNote',
			'cutVersion.approval',
			'cutVersion.approvalNote',
			'approver.name as approvedByName',
			'cutVersion.carryOffsetFrames',
			'cutVersion.version',
			'cutVersion.createdAt',
			'footage.id as footageId',
			'footage.fileName',
			'footage.durationSeconds',
			'episode.frameRate',
			sql<boolean>`proxy.footage_id IS NOT NULL`.as('hasProxy'),
			sql<boolean>`poster.footage_id IS NOT NULL`.as('hasPoster'),
			'sprite.details as spriteDetails'
		])
		.where('episode.id', '=', episodeId)
		.where('episode.channelId', '=', channelId)
		.orderBy('cutVersion.number', 'desc');
}

type VersionRow = Awaited<ReturnType<ReturnType<typeof cutVersionsQuery>['execute']>>[number];

export function toVersionView(row: VersionRow): CutVersionView {
	const file = `/api/footage/${row.footageId}`;
	return {
		id: row.id,
		number: row.number,
		label: versionLabel(row.number),
		changeNote: row.changeNote,
		approval: row.approval,
		approvalLabel: APPROVAL_LABELS[row.approval],
		approvalNote: row.approvalNote,
		approvedByName: row.approvedByName,
		carryOffsetFrames: row.carryOffsetFrames,
		version: row.version,
		createdAt: new Date(row.createdAt).toISOString(),
		footageId: row.footageId,
		fileName: row.fileName,
		lengthFrames:
			row.durationSeconds === null
				? null
				: secondsToFrames(Number(row.durationSeconds), row.frameRate),
		playUrl: row.hasProxy ? `${file}/media/proxy` : `${file}/file`,
		posterUrl: row.hasPoster ? `${file}/media/poster` : null,
		spriteUrl: row.spriteDetails ? `${file}/media/sprite` : null,
		sprite: row.spriteDetails ?? null
	};
}

/** The episode's versions, newest (current) first; [] when no cut is uploaded. */
export async function cutVersionsFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<CutVersionView[]> {
	if (!isUuid(episodeId)) return [];
	const rows = await cutVersionsQuery(executor, channelId, episodeId).execute();
	return rows.map(toVersionView);
}

/** The version row, in the episode (already checked against the channel). */
async function versionIn(trx: Executor, episodeId: string, versionId: string) {
	if (!isUuid(versionId)) throw versionNotFound();
	const row = await trx
		.selectFrom('cutVersion')
		.selectAll()
		.where('id', '=', versionId)
		.where('episodeId', '=', episodeId)
		.executeTakeFirst();
	if (!row) throw versionNotFound();
	return row;
}

async function newestNumber(trx: Executor, episodeId: string): Promise<number> {
	const row = await trx
		.selectFrom('cutVersion')
		.select(sql<number>`coalesce(max(number), 0)`.as('newest'))
		.where('episodeId', '=', episodeId)
		.executeTakeFirstOrThrow();
	return Number(row.newest);
}

/** 409 unless the version is the current (newest) one: only it can be commented, approved or shifted. */
export async function currentVersionIn(trx: Executor, episodeId: string, versionId: string) {
	const row = await versionIn(trx, episodeId, versionId);
	const newest = await newestNumber(trx, episodeId);
	if (row.number !== newest)
		throw new DomainError(
			409,
			`${versionLabel(row.number)} has been replaced by ${versionLabel(newest)}: watch and answer ${versionLabel(newest)}, where the open comments are now.`,
			undefined,
			{ currentNumber: newest }
		);
	return row;
}

function stale(what: string): never {
	throw new DomainError(
		409,
		`Someone changed ${what} while you were working on it. Reload the page to see theirs, then make your change again.`
	);
}

/** Rewrites a version's change note (any version: the note says what changed in it). */
export async function setChangeNote(
	channelId: string,
	episodeId: string,
	versionId: string,
	input: { changeNote: string; version: number }
): Promise<void> {
	await db.transaction().execute(async (trx) => {
		const episode = await episodeOpenFor(trx, channelId, 'cut', { episodeId });
		const row = await versionIn(trx, episode.id, versionId);
		const updated = await trx
			.updateTable('cutVersion')
			.set((eb) => ({ changeNote: input.changeNote, version: eb('version', '+', 1) }))
			.where('id', '=', row.id)
			.where('version', '=', input.version)
			.executeTakeFirst();
		if (Number(updated.numUpdatedRows) !== 1) stale(`the note of ${versionLabel(row.number)}`);
	});
}

/**
 * A signed shift typed as a length: `+00:00:02;00`, `-1.5` (seconds), `0`. Read in the episode's
 * programme form without its start; a mistake is a 400 on `offset`.
 */
export function offsetFromText(text: string, clock: ProgrammeClock): number {
	const trimmed = text.trim();
	const sign = trimmed.startsWith('-') ? -1 : 1;
	const rest = trimmed.replace(/^[+-]\s*/, '');
	return (
		sign *
		frameFromTyped('offset', () => {
			if (/^\d+(\.\d+)?$/.test(rest)) return secondsToFrames(Number(rest), clock.rate);
			if (rest === '') throw new TimecodeError('Type the shift, e.g. +00:00:02;00 or -1.5, or 0.');
			return clock.parseLength(rest);
		})
	);
}

export interface CarryPreviewRow {
	commentId: string;
	body: string;
	from: string;
	to: string;
}

/** What an offset would do to the comments carried into the current version, before anything is written. */
export async function carryPreview(
	channelId: string,
	episodeId: string,
	versionId: string,
	offsetText: string
): Promise<{ offsetFrames: number; rows: CarryPreviewRow[] }> {
	const episode = await db
		.selectFrom('episode')
		.selectAll()
		.where('id', '=', isUuid(episodeId) ? episodeId : '00000000-0000-0000-0000-000000000000')
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!episode) throw notFound('That episode');
	const clock = clockOfEpisode(episode);
	const offsetFrames = offsetFromText(offsetText, clock);
	const version = await currentVersionIn(db, episode.id, versionId);
	const carried = await db
		.selectFrom('cutComment')
		.select(['id', 'body', 'sourceStartFrame', 'sourceEndFrame'])
		.where('cutVersionId', '=', version.id)
		.where('carriedFrom', 'is not', null)
		.where('state', '=', 'open')
		.orderBy('sourceStartFrame')
		.execute();
	return {
		offsetFrames,
		rows: carried.map((comment) => {
			const source = {
				startFrame: comment.sourceStartFrame ?? 0,
				endFrame: comment.sourceEndFrame
			};
			return {
				commentId: comment.id,
				body: comment.body,
				from: clock.format(source.startFrame),
				to: clock.format(carriedFrames(source, offsetFrames).startFrame)
			};
		})
	};
}

/**
 * Moves the comments carried into the current version by the confirmed offset, from where they
 * were on the version they came from (so confirming again replaces the last offset).
 */
export async function confirmCarryOffset(
	channelId: string,
	episodeId: string,
	versionId: string,
	input: { offset: string; version: number }
): Promise<{ offsetFrames: number; moved: number }> {
	return db.transaction().execute(async (trx) => {
		const episode = await episodeOpenFor(trx, channelId, 'cut', { episodeId });
		const offsetFrames = offsetFromText(input.offset, clockOfEpisode(episode));
		const row = await currentVersionIn(trx, episode.id, versionId);
		const updated = await trx
			.updateTable('cutVersion')
			.set((eb) => ({ carryOffsetFrames: offsetFrames, version: eb('version', '+', 1) }))
			.where('id', '=', row.id)
			.where('version', '=', input.version)
			.executeTakeFirst();
		if (Number(updated.numUpdatedRows) !== 1) stale(`the offset of ${versionLabel(row.number)}`);
		// Held at frame 0 as carriedFrames does: the shift is at least minus the start.
		const moved = await sql`
			UPDATE cut_comment SET
				start_frame = source_start_frame + greatest(${offsetFrames}::integer, -source_start_frame),
				end_frame = source_end_frame + greatest(${offsetFrames}::integer, -source_start_frame),
				version = version + 1
			WHERE cut_version_id = ${row.id} AND carried_from IS NOT NULL AND state = 'open'
		`.execute(trx);
		return { offsetFrames, moved: Number(moved.numAffectedRows ?? 0) };
	});
}

/** The producer approves the current version or asks for changes (with a note). */
export async function answerVersion(
	channelId: string,
	personId: string,
	episodeId: string,
	versionId: string,
	input: ApprovalInput
): Promise<void> {
	await db.transaction().execute(async (trx) => {
		const episode = await episodeOpenFor(trx, channelId, 'cut', { episodeId });
		const row = await currentVersionIn(trx, episode.id, versionId);
		const updated = await trx
			.updateTable('cutVersion')
			.set((eb) => ({
				approval: input.decision,
				approvalNote: input.note ? input.note : null,
				approvedBy: personId,
				approvedAt: new Date(),
				version: eb('version', '+', 1)
			}))
			.where('id', '=', row.id)
			.where('version', '=', input.version)
			.executeTakeFirst();
		if (Number(updated.numUpdatedRows) !== 1) stale(versionLabel(row.number));
	});
}
