/**
 * The shot list with its takes, as the camera operator logs them on the day: clip name, source
 * timecode in and out (SMPTE ST 12-1 at the episode's rate), good or no good, a note, and the
 * uploaded clip the take is in. The shoot → edit gate counts good takes with footage.
 */
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import { episodeInChannel } from '../episodes/episodes';
import { frameFromTyped } from '../edit/typed-time';
import { formatTimecode, parseTimecode, type FrameRate } from '$lib/timecode';
import type { TakeCreate, TakeUpdate } from '$lib/schemas/takes';
import { hazardById } from '$lib/cautions';

/** Every segment of the episode with its shots and their takes, and the footage a take can point at. */
export async function shotListFor(channelId: string, episodeId: string) {
	const episode = await episodeInChannel(channelId, episodeId);
	const rate = episode.frameRate;
	const [segments, shots, takes, footage, cautions] = await Promise.all([
		db
			.selectFrom('segment')
			.select(['id', 'position', 'title', 'needsFootage'])
			.where('episodeId', '=', episode.id)
			.orderBy('position')
			.execute(),
		db
			.selectFrom('shot')
			.innerJoin('segment', 'segment.id', 'shot.segmentId')
			.selectAll('shot')
			.where('segment.episodeId', '=', episode.id)
			.orderBy('shot.position')
			.execute(),
		db
			.selectFrom('take')
			.innerJoin('shot', 'shot.id', 'take.shotId')
			.innerJoin('segment', 'segment.id', 'shot.segmentId')
			.leftJoin('footage', 'footage.id', 'take.footageId')
			.selectAll('take')
			.select(['footage.clipName as footageClip'])
			.where('segment.episodeId', '=', episode.id)
			.orderBy('take.createdAt')
			.execute(),
		db
			.selectFrom('footage')
			.select(['id', 'clipName', 'fileName', 'cameraLabel'])
			.where('episodeId', '=', episode.id)
			.where('purpose', '=', 'footage')
			.orderBy('clipName')
			.execute(),
		// The cautions of each hazardous segment: the crew reads them before filming the work.
		db
			.selectFrom('caution')
			.innerJoin('segment', 'segment.id', 'caution.segmentId')
			.select(['caution.segmentId', 'caution.hazard', 'caution.text'])
			.where('segment.episodeId', '=', episode.id)
			.orderBy('caution.hazard')
			.execute()
	]);
	const tc = (frames: number, dropFrame: boolean) => formatTimecode(frames, rate, { dropFrame });
	return {
		episode: { id: episode.id, title: episode.title, frameRate: rate },
		footage,
		segments: segments.map((segment) => ({
			...segment,
			cautions: cautions
				.filter((caution) => caution.segmentId === segment.id)
				.map((caution) => ({
					hazard: caution.hazard,
					label: hazardById(caution.hazard)?.label ?? caution.hazard,
					text: caution.text
				})),
			shots: shots
				.filter((shot) => shot.segmentId === segment.id)
				.map((shot) => ({
					...shot,
					takes: takes
						.filter((take) => take.shotId === shot.id)
						.map((take) => ({
							...take,
							sourceIn: tc(take.sourceInFrames, take.sourceDropFrame),
							sourceOut: tc(take.sourceOutFrames, take.sourceDropFrame),
							lengthFrames: take.sourceOutFrames - take.sourceInFrames
						}))
				}))
		}))
	};
}

async function shotInChannel(channelId: string, shotId: string) {
	if (!isUuid(shotId)) throw notFound('That shot');
	const shot = await db
		.selectFrom('shot')
		.innerJoin('segment', 'segment.id', 'shot.segmentId')
		.innerJoin('episode', 'episode.id', 'segment.episodeId')
		.select(['shot.id', 'episode.id as episodeId', 'episode.frameRate'])
		.where('shot.id', '=', shotId)
		.where('episode.channelId', '=', channelId)
		.executeTakeFirst();
	if (!shot) throw notFound('That shot');
	return shot;
}

async function checkFootage(episodeId: string, footageId: string | null | undefined) {
	if (!footageId) return;
	const clip = await db
		.selectFrom('footage')
		.select('id')
		.where('id', '=', footageId)
		.where('episodeId', '=', episodeId)
		.executeTakeFirst();
	if (!clip)
		throw new DomainError(400, 'That clip is not in this episode’s footage.', {
			footageId: ['Pick a clip from this episode’s footage.']
		});
}

export async function logTake(channelId: string, shotId: string, input: TakeCreate) {
	const shot = await shotInChannel(channelId, shotId);
	const rate = shot.frameRate;
	// Source timecode is read as the camera wrote it: ';' before the frames is drop-frame, ':' is not.
	const sourceDropFrame = input.sourceIn.includes(';');
	if (input.sourceOut.includes(';') !== sourceDropFrame) {
		throw new DomainError(
			400,
			'Type the in and out points the same way: both drop-frame (;) or both non-drop (:).',
			{ sourceOut: ['Use the same separator as the in point.'] }
		);
	}
	const sourceInFrames = sourceFrames(input.sourceIn, rate, 'sourceIn');
	const sourceOutFrames = sourceFrames(input.sourceOut, rate, 'sourceOut');
	if (sourceOutFrames <= sourceInFrames)
		throw new DomainError(400, 'Make the out point later than the in point.', {
			sourceOut: ['Make the out point later than the in point.']
		});
	await checkFootage(shot.episodeId, input.footageId);
	return db
		.insertInto('take')
		.values({
			shotId,
			clipName: input.clipName,
			sourceInFrames,
			sourceOutFrames,
			sourceDropFrame,
			good: input.good,
			note: input.note,
			footageId: input.footageId
		})
		.returningAll()
		.executeTakeFirstOrThrow();
}

function sourceFrames(text: string, rate: FrameRate, field: string): number {
	return frameFromTyped(field, () => parseTimecode(text, rate));
}

async function takeInChannel(channelId: string, takeId: string) {
	if (!isUuid(takeId)) throw notFound('That take');
	const take = await db
		.selectFrom('take')
		.innerJoin('shot', 'shot.id', 'take.shotId')
		.innerJoin('segment', 'segment.id', 'shot.segmentId')
		.innerJoin('episode', 'episode.id', 'segment.episodeId')
		.select(['take.id', 'episode.id as episodeId'])
		.where('take.id', '=', takeId)
		.where('episode.channelId', '=', channelId)
		.executeTakeFirst();
	if (!take) throw notFound('That take');
	return take;
}

export async function updateTake(channelId: string, takeId: string, input: TakeUpdate) {
	const take = await takeInChannel(channelId, takeId);
	await checkFootage(take.episodeId, input.footageId);
	const { version, ...change } = input;
	const updated = await db
		.updateTable('take')
		.set((eb) => ({
			...Object.fromEntries(Object.entries(change).filter(([, v]) => v !== undefined)),
			version: eb('version', '+', 1)
		}))
		.where('id', '=', takeId)
		.where('version', '=', version)
		.returningAll()
		.executeTakeFirst();
	if (!updated) {
		const current = await db
			.selectFrom('take')
			.selectAll()
			.where('id', '=', takeId)
			.executeTakeFirstOrThrow();
		throw new DomainError(
			409,
			'Someone changed this take meanwhile; the list shows their version.',
			undefined,
			{ current }
		);
	}
	return updated;
}

export async function deleteTake(channelId: string, takeId: string) {
	await takeInChannel(channelId, takeId);
	await db.deleteFrom('take').where('id', '=', takeId).execute();
}
