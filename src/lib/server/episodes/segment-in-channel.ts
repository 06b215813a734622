/**
 * Reaching one segment: only through its episode's channel, so another channel's segment is "not
 * found" like one that does not exist.
 */
import { db } from '../db';
import { notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import type { Executor } from './episodes';

export const segmentNotFound = () => notFound('That segment');

/** The segment row with its episode (checked against the channel), optionally locked. */
export async function segmentInChannel(
	executor: Executor,
	channelId: string,
	segmentId: string,
	options: { lock?: boolean } = {}
) {
	if (!isUuid(segmentId)) throw segmentNotFound();
	let query = executor
		.selectFrom('segment')
		.innerJoin('episode', 'episode.id', 'segment.episodeId')
		.selectAll('segment')
		.select([
			'episode.frameRate',
			'episode.timecodeDropFrame',
			'episode.timecodeStart',
			'episode.stage',
			'episode.cutDurationFrames',
			'episode.title as episodeTitle'
		])
		.where('segment.id', '=', segmentId)
		.where('episode.channelId', '=', channelId);
	if (options.lock) query = query.forUpdate('segment');
	const row = await query.executeTakeFirst();
	if (!row) throw segmentNotFound();
	return row;
}

/** 404 unless the segment is one of this episode's (for pages whose URL names both). */
export async function assertSegmentOfEpisode(
	channelId: string,
	episodeId: string,
	segmentId: string
): Promise<void> {
	const segment = await segmentInChannel(db, channelId, segmentId);
	if (segment.episodeId !== episodeId) throw segmentNotFound();
}
