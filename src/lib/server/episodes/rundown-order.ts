/**
 * The order of the rundown: a whole new order (dragged on the page or sent by a client) or one step
 * up or down (the buttons that work without JavaScript).
 */
import { sql } from 'kysely';
import { db } from '../db';
import { DomainError } from '../http/api';
import { episodeOpenFor, refuseIfFixed } from './stage-locks';
import { segmentInChannel, segmentNotFound } from './segment-in-channel';

/** Puts the rundown in a new order; the list must name every segment of the episode exactly once. */
export async function reorderSegments(
	channelId: string,
	episodeId: string,
	order: readonly string[]
): Promise<{ order: string[] }> {
	return db.transaction().execute(async (trx) => {
		await episodeOpenFor(trx, channelId, 'rundown', { episodeId });
		const existing = (
			await trx
				.selectFrom('segment')
				.select('id')
				.where('episodeId', '=', episodeId)
				.orderBy('position')
				.execute()
		).map((row) => row.id);
		const known = new Set(existing);
		const seen = new Set<string>();
		const duplicates = order.filter((id) => (seen.has(id) ? true : (seen.add(id), false)));
		const unknown = order.filter((id) => !known.has(id));
		const missing = existing.filter((id) => !seen.has(id));
		if (duplicates.length || unknown.length || missing.length) {
			const problems = [
				...(missing.length
					? [
							`${missing.length} segment${missing.length === 1 ? ' is' : 's are'} missing from the new order.`
						]
					: []),
				...(unknown.length
					? [
							`${unknown.length} id${unknown.length === 1 ? ' is' : 's are'} not a segment of this episode.`
						]
					: []),
				...(duplicates.length
					? [
							`${duplicates.length} segment${duplicates.length === 1 ? ' is' : 's are'} listed twice.`
						]
					: [])
			];
			throw new DomainError(
				400,
				`The rundown was not reordered: ${problems.join(' ')} Reload the rundown and try again; nothing was changed.`,
				{ order: problems },
				{ missing, unknown, duplicates }
			);
		}
		if (order.length) {
			const values = sql.join(order.map((id, index) => sql`(${id}::uuid, ${index + 1}::int)`));
			await sql`UPDATE segment SET position = v.position, updated_at = now() FROM (VALUES ${values}) AS v(id, position) WHERE segment.id = v.id AND segment.episode_id = ${episodeId}`.execute(
				trx
			);
		}
		return { order: [...order] };
	});
}

/** One step up or down, for the rundown's buttons that work without JavaScript. */
export async function moveSegment(
	channelId: string,
	episodeId: string,
	segmentId: string,
	direction: 'up' | 'down'
): Promise<{ order: string[] }> {
	const segment = await segmentInChannel(db, channelId, segmentId);
	if (segment.episodeId !== episodeId) throw segmentNotFound();
	// Refused here too, so a step past either end doesn't read as done on a fixed rundown.
	refuseIfFixed(segment.stage, 'rundown');
	const ids = (
		await db
			.selectFrom('segment')
			.select('id')
			.where('episodeId', '=', segment.episodeId)
			.orderBy('position')
			.execute()
	).map((row) => row.id);
	const from = ids.indexOf(segmentId);
	const to = direction === 'up' ? from - 1 : from + 1;
	if (to < 0 || to >= ids.length) return { order: ids };
	[ids[from], ids[to]] = [ids[to], ids[from]];
	return reorderSegments(channelId, segment.episodeId, ids);
}
