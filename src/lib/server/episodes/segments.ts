/**
 * Changing a segment of the rundown: adding one, changing its details (not its script), deleting it.
 * Every function takes the channel id and reaches a segment only through its episode's channel. A
 * segment carries a version; a save that names a stale one answers 409 with the current segment in
 * `current`.
 */
import { error } from '@sveltejs/kit';
import { db } from '../db';
import { DomainError } from '../http/api';
import { type Executor } from './episodes';
import { episodeOpenFor } from './stage-locks';
import { segmentView, type SegmentView } from './rundown';
import { segmentInChannel } from './segment-in-channel';
import { ensureCautions, inHazardOrder } from './cautions';
import { lengthFromText } from './typed-timecode';
import { clockOfEpisode } from './programme-timecode';
import { SEGMENT_KIND_INFO, type SegmentKind } from '$lib/rundown';
import {
	MAX_SEGMENTS_PER_EPISODE,
	type SegmentCreate,
	type SegmentUpdate
} from '$lib/schemas/episodes';
import type { Role } from '../db/types';

async function checkBuild(
	executor: Executor,
	channelId: string,
	buildId: string | null | undefined
): Promise<void> {
	if (!buildId) return;
	const build = await executor
		.selectFrom('build')
		.select('id')
		.where('id', '=', buildId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!build)
		throw new DomainError(400, 'That build is not in this channel.', {
			buildId: ['Pick a build from the list.']
		});
}

/** Teasers alone may promise a follow-up; the promised episode must be another episode of this channel. */
async function checkPromise(
	executor: Executor,
	channelId: string,
	episodeId: string,
	kind: SegmentKind,
	promiseEpisodeId: string | null | undefined,
	promiseTitle: string | null | undefined
): Promise<void> {
	if (kind !== 'teaser' && (promiseEpisodeId || promiseTitle)) {
		throw new DomainError(
			400,
			'Only a teaser segment can promise a follow-up episode. Change the kind to teaser first.',
			{ promiseTitle: ['Only for teasers.'] }
		);
	}
	if (!promiseEpisodeId) return;
	if (promiseEpisodeId === episodeId)
		throw new DomainError(400, 'An episode cannot promise itself as its follow-up.', {
			promiseEpisodeId: ['Pick another episode.']
		});
	const promised = await executor
		.selectFrom('episode')
		.select('id')
		.where('id', '=', promiseEpisodeId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!promised)
		throw new DomainError(400, 'That episode is not in this channel.', {
			promiseEpisodeId: ['Pick an episode from the list.']
		});
}

/** Adds a segment at the end of the rundown, with an empty script and the default caution of each flag. */
export async function createSegment(
	channelId: string,
	episodeId: string,
	input: SegmentCreate
): Promise<SegmentView> {
	return db.transaction().execute(async (trx) => {
		// Locking the episode serialises position numbers between two people adding at once.
		await episodeOpenFor(trx, channelId, 'rundown', { episodeId });
		await checkBuild(trx, channelId, input.buildId);
		await checkPromise(
			trx,
			channelId,
			episodeId,
			input.kind,
			input.promiseEpisodeId,
			input.promiseTitle
		);
		const { count, last } = await trx
			.selectFrom('segment')
			.select((eb) => [eb.fn.countAll<number>().as('count'), eb.fn.max('position').as('last')])
			.where('episodeId', '=', episodeId)
			.executeTakeFirstOrThrow();
		if (Number(count) >= MAX_SEGMENTS_PER_EPISODE)
			throw new DomainError(400, `An episode holds at most ${MAX_SEGMENTS_PER_EPISODE} segments.`);
		const hazards = inHazardOrder(input.hazards ?? []);
		const segment = await trx
			.insertInto('segment')
			.values({
				episodeId,
				position: Number(last ?? 0) + 1,
				kind: input.kind,
				title: input.title,
				plannedSeconds: input.plannedSeconds,
				buildId: input.buildId ?? null,
				needsFootage: input.needsFootage ?? SEGMENT_KIND_INFO[input.kind].needsFootage,
				hazards,
				recordedFrames: null,
				promiseEpisodeId: input.promiseEpisodeId ?? null,
				promiseTitle: input.promiseTitle || null
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await trx
			.insertInto('segmentScript')
			.values({ segmentId: segment.id, body: '', updatedBy: null })
			.execute();
		await ensureCautions(trx, segment.id, hazards);
		return segmentView(channelId, segment.id, trx);
	});
}

const staleSegment = async (channelId: string, segmentId: string, executor: Executor) =>
	new DomainError(
		409,
		'Someone changed this segment while you were editing. Their version is shown; your changes are still in the form.',
		undefined,
		{
			current: await segmentView(channelId, segmentId, executor)
		}
	);

/**
 * The host and producers change a segment's plan; the editor changes only its length in the cut.
 * Answers 403 for a field the caller's roles don't cover.
 */
export function checkSegmentChangeRoles(roles: readonly Role[], input: SegmentUpdate): void {
	const planFields = (
		[
			'kind',
			'title',
			'plannedSeconds',
			'buildId',
			'needsFootage',
			'hazards',
			'promiseEpisodeId',
			'promiseTitle'
		] as const
	).filter((field) => input[field] !== undefined);
	const setsRecorded = input.recorded !== undefined || input.recordedFrames !== undefined;
	if (planFields.length && !roles.some((role) => role === 'producer' || role === 'host'))
		error(
			403,
			'The segment’s plan is the host’s or a producer’s to change. You can set its length in the cut.'
		);
	if (setsRecorded && !roles.some((role) => role === 'producer' || role === 'editor'))
		error(403, 'The length in the cut is set by the editor or a producer.');
}

/** Changes a segment's details (not its script); new hazard flags get their default caution. */
export async function updateSegment(
	channelId: string,
	segmentId: string,
	input: SegmentUpdate
): Promise<SegmentView> {
	return db.transaction().execute(async (trx) => {
		await episodeOpenFor(trx, channelId, 'rundown', { segmentId });
		const segment = await segmentInChannel(trx, channelId, segmentId, { lock: true });
		if (segment.version !== input.version) throw await staleSegment(channelId, segmentId, trx);
		const kind = input.kind ?? segment.kind;
		const promiseEpisodeId =
			input.promiseEpisodeId === undefined ? segment.promiseEpisodeId : input.promiseEpisodeId;
		const promiseTitle =
			input.promiseTitle === undefined ? segment.promiseTitle : input.promiseTitle || null;
		// Changing a teaser into another kind drops its promise rather than refusing the change.
		const keepsPromise = kind === 'teaser';
		if (keepsPromise)
			await checkPromise(trx, channelId, segment.episodeId, kind, promiseEpisodeId, promiseTitle);
		else if (input.promiseEpisodeId || input.promiseTitle)
			await checkPromise(
				trx,
				channelId,
				segment.episodeId,
				kind,
				input.promiseEpisodeId,
				input.promiseTitle
			);
		if (input.buildId !== undefined) await checkBuild(trx, channelId, input.buildId);
		let recordedFrames = segment.recordedFrames;
		if (input.recordedFrames !== undefined) recordedFrames = input.recordedFrames;
		else if (input.recorded !== undefined)
			recordedFrames =
				input.recorded === null || input.recorded === ''
					? null
					: lengthFromText(input.recorded, clockOfEpisode(segment), 'recorded');
		const hazards = input.hazards ? inHazardOrder(input.hazards) : segment.hazards;
		await trx
			.updateTable('segment')
			.set({
				kind,
				title: input.title ?? segment.title,
				plannedSeconds: input.plannedSeconds ?? segment.plannedSeconds,
				buildId: input.buildId === undefined ? segment.buildId : input.buildId,
				needsFootage: input.needsFootage ?? segment.needsFootage,
				hazards,
				recordedFrames,
				promiseEpisodeId: keepsPromise ? promiseEpisodeId : null,
				promiseTitle: keepsPromise ? promiseTitle : null,
				version: segment.version + 1,
				updatedAt: new Date()
			})
			.where('id', '=', segmentId)
			.execute();
		await ensureCautions(trx, segmentId, hazards);
		return segmentView(channelId, segmentId, trx);
	});
}

/** Removes a segment and closes the gap; refused once takes are logged against its shots. */
export async function deleteSegment(
	channelId: string,
	segmentId: string,
	version: number
): Promise<{ id: string }> {
	return db.transaction().execute(async (trx) => {
		await episodeOpenFor(trx, channelId, 'rundown', { segmentId });
		const segment = await segmentInChannel(trx, channelId, segmentId, { lock: true });
		if (segment.version !== version) throw await staleSegment(channelId, segmentId, trx);
		const takes = await trx
			.selectFrom('take')
			.innerJoin('shot', 'shot.id', 'take.shotId')
			.select((eb) => eb.fn.countAll<number>().as('count'))
			.where('shot.segmentId', '=', segmentId)
			.executeTakeFirstOrThrow();
		if (Number(takes.count) > 0) {
			throw new DomainError(
				409,
				`“${segment.title}” has ${takes.count} logged take${Number(takes.count) === 1 ? '' : 's'}: it can’t be deleted. Untick “needs footage” or rename it instead.`
			);
		}
		await trx.deleteFrom('segment').where('id', '=', segmentId).execute();
		await trx
			.updateTable('segment')
			.set((eb) => ({ position: eb('position', '-', 1) }))
			.where('episodeId', '=', segment.episodeId)
			.where('position', '>', segment.position)
			.execute();
		return { id: segmentId };
	});
}
