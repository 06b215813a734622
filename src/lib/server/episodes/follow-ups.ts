/**
 * Follow-ups: teasers that promise a future episode (a real episode in any stage, or a placeholder
 * title). The list shows promises not kept yet, oldest first: a promise made in a published
 * episode is already public, so it sorts by when the teasing episode went (or goes) out.
 */
import { sql } from 'kysely';
import { db } from '../db';

export async function listFollowUps(channelId: string) {
	const rows = await db
		.selectFrom('segment')
		.innerJoin('episode as teasing', 'teasing.id', 'segment.episodeId')
		.leftJoin('episode as promised', 'promised.id', 'segment.promiseEpisodeId')
		.select([
			'segment.id as segmentId',
			'segment.title as segmentTitle',
			'segment.position as segmentPosition',
			'segment.promiseTitle',
			'segment.createdAt',
			'teasing.id as teasingEpisodeId',
			'teasing.title as teasingTitle',
			'teasing.stage as teasingStage',
			'teasing.publishDate as teasingPublishDate',
			'promised.id as promisedEpisodeId',
			'promised.title as promisedTitle',
			'promised.stage as promisedStage',
			'promised.publishDate as promisedPublishDate'
		])
		.where('teasing.channelId', '=', channelId)
		.where('segment.kind', '=', 'teaser')
		.where((eb) =>
			eb.or([
				eb('segment.promiseEpisodeId', 'is not', null),
				eb(sql`coalesce(trim(segment.promise_title), '')`, '!=', '')
			])
		)
		.where((eb) => eb.or([eb('promised.id', 'is', null), eb('promised.stage', '!=', 'published')]))
		.orderBy(sql`teasing.publish_date ASC NULLS LAST`)
		.orderBy('segment.createdAt')
		.orderBy('segment.id')
		.execute();
	return rows.map((row) => ({
		...row,
		createdAt: new Date(row.createdAt).toISOString(),
		/** Viewers have heard the promise once the teasing episode is out. */
		isPublic: row.teasingStage === 'published'
	}));
}

export type FollowUp = Awaited<ReturnType<typeof listFollowUps>>[number];
