/**
 * A segment's shot list: what to film, from which angle, on which camera, in order. The take counts
 * beside each shot are read with the rundown.
 */
import { db } from '../db';
import { segmentView, type ShotView } from './rundown';
import { segmentInChannel } from './segment-in-channel';
import { episodeOpenFor } from './stage-locks';
import type { ShotCreate } from '$lib/schemas/episodes';

/** The shot list of one segment, in order. */
export async function listShots(channelId: string, segmentId: string): Promise<ShotView[]> {
	return (await segmentView(channelId, segmentId)).shots;
}

/** Adds a shot at the end of a segment's shot list. */
export async function addShot(
	channelId: string,
	segmentId: string,
	input: ShotCreate
): Promise<ShotView> {
	return db.transaction().execute(async (trx) => {
		await episodeOpenFor(trx, channelId, 'shots', { segmentId });
		await segmentInChannel(trx, channelId, segmentId, { lock: true });
		const { last } = await trx
			.selectFrom('shot')
			.select((eb) => eb.fn.max('position').as('last'))
			.where('segmentId', '=', segmentId)
			.executeTakeFirstOrThrow();
		const shot = await trx
			.insertInto('shot')
			.values({
				segmentId,
				what: input.what,
				angle: input.angle,
				roll: input.roll,
				camera: input.camera,
				notes: input.notes,
				position: Number(last ?? 0) + 1
			})
			.returningAll()
			.executeTakeFirstOrThrow();
		return {
			id: shot.id,
			what: shot.what,
			angle: shot.angle,
			roll: shot.roll,
			camera: shot.camera,
			notes: shot.notes,
			position: shot.position,
			version: shot.version,
			takes: 0,
			goodTakes: 0,
			goodTakesWithFootage: 0
		};
	});
}
