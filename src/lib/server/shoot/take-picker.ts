/**
 * The take picker's search: a few takes of one episode whose clip name or shot holds the typed
 * words, so the notes page never loads every take of an episode (thousands at a real channel's
 * size). A form shows its current take from its own row; the picker only fetches candidates.
 */
import { sql } from 'kysely';
import { db } from '../db';
import { episodeInChannel, type Executor } from '../episodes/episodes';
import { formatTimecode } from '$lib/timecode';
import type { TakePickerQuery } from '$lib/schemas/takes';

export interface TakeChoice {
	id: string;
	clipName: string;
	segmentId: string;
	/** What the shot shows (the shot list's "what"). */
	shot: string;
	good: boolean;
	/** Source in and out as the take's camera showed them (drop-frame when logged with ';'). */
	sourceIn: string;
	sourceOut: string;
}

/** `%`, `_` and `\` typed into a search are searched for, not used as LIKE wildcards. */
const escapeLike = (text: string) => text.replace(/[\\%_]/g, '\\$&');

/**
 * Takes of the channel's episode whose clip name or shot holds every typed word (case-insensitive),
 * in shot-list order (segment, shot, clip name, id); only one segment's when `segment` is given;
 * at most `limit`. Another channel's episode is a 404.
 */
export async function pickTakes(
	channelId: string,
	episodeId: string,
	query: TakePickerQuery,
	executor: Executor = db
): Promise<TakeChoice[]> {
	const episode = await episodeInChannel(channelId, episodeId, executor);
	let select = executor
		.selectFrom('take')
		.innerJoin('shot', 'shot.id', 'take.shotId')
		.innerJoin('segment', 'segment.id', 'shot.segmentId')
		.select([
			'take.id',
			'take.clipName',
			'shot.segmentId',
			'shot.what',
			'take.good',
			'take.sourceInFrames',
			'take.sourceOutFrames',
			'take.sourceDropFrame'
		])
		.where('segment.episodeId', '=', episode.id);
	if (query.segment) select = select.where('shot.segmentId', '=', query.segment);
	for (const word of (query.q ?? '').split(/\s+/).filter(Boolean).slice(0, 6)) {
		const pattern = sql<string>`lower(${`%${escapeLike(word)}%`})`;
		select = select.where((eb) =>
			eb.or([
				eb(sql<string>`lower(take.clip_name)`, 'like', pattern),
				eb(sql<string>`lower(shot.what)`, 'like', pattern)
			])
		);
	}
	const rows = await select
		.orderBy('segment.position')
		.orderBy('shot.position')
		.orderBy('take.clipName')
		.orderBy('take.id')
		.limit(query.limit)
		.execute();
	const rate = episode.frameRate;
	return rows.map((take) => {
		const form = { dropFrame: take.sourceDropFrame };
		return {
			id: take.id,
			clipName: take.clipName,
			segmentId: take.segmentId,
			shot: take.what,
			good: take.good,
			sourceIn: formatTimecode(take.sourceInFrames, rate, form),
			sourceOut: formatTimecode(take.sourceOutFrames, rate, form)
		};
	});
}
