/**
 * The episode list a producer filters and sorts: each row carries what the list shows at a glance
 * (stage, publish date, crew, builds, segment count and planned length). Filtered by channel.
 */
import { sql } from 'kysely';
import { db } from '../db';
import { withAssignments, withBuilds } from './episodes';
import { STAGES } from '$lib/stages';
import { scriptChangedSinceApproval } from './script-status';
import { shownScriptStatus } from '$lib/script/status';
import type { EpisodeListQuery } from '$lib/schemas/episodes';

const stageOrder = sql<number>`array_position(ARRAY[${sql.join(STAGES.map((stage) => sql.lit(stage)))}]::text[], episode.stage)`;

/** The episode list with filters and sort; each row carries what the list shows at a glance. */
export async function listEpisodes(channelId: string, query: EpisodeListQuery) {
	let select = db
		.selectFrom('episode')
		.select((eb) => [
			'episode.id',
			'episode.title',
			'episode.slug',
			'episode.logline',
			'episode.stage',
			'episode.publishDate',
			'episode.targetRuntimeSeconds',
			'episode.scriptStatus',
			scriptChangedSinceApproval().as('scriptChanged'),
			'episode.createdAt',
			'episode.version',
			withAssignments(eb),
			withBuilds(eb),
			eb
				.selectFrom('segment')
				.select((inner) => inner.fn.countAll<number>().as('count'))
				.whereRef('segment.episodeId', '=', 'episode.id')
				.as('segmentCount'),
			eb
				.selectFrom('segment')
				.select((inner) =>
					inner.fn
						.coalesce(inner.fn.sum<number>('segment.plannedSeconds'), sql<number>`0`)
						.as('planned')
				)
				.whereRef('segment.episodeId', '=', 'episode.id')
				.as('plannedSeconds')
		])
		.where('episode.channelId', '=', channelId);
	if (query.stage) select = select.where('episode.stage', '=', query.stage);
	if (query.assignee) {
		const assignee = query.assignee;
		select = select.where((eb) =>
			eb.exists(
				eb
					.selectFrom('episodeAssignment')
					.select('episodeAssignment.role')
					.whereRef('episodeAssignment.episodeId', '=', 'episode.id')
					.where('episodeAssignment.personId', '=', assignee)
			)
		);
	}
	if (query.from) select = select.where('episode.publishDate', '>=', query.from);
	if (query.to) select = select.where('episode.publishDate', '<=', query.to);
	const direction = query.direction;
	const nulls = sql.raw(direction === 'asc' ? 'NULLS LAST' : 'NULLS FIRST');
	switch (query.sort) {
		case 'title':
			select = select.orderBy(sql`lower(episode.title) ${sql.raw(direction)}`);
			break;
		case 'stage':
			select = select
				.orderBy(sql`${stageOrder} ${sql.raw(direction)}`)
				.orderBy('episode.publishDate', (order) => order.asc().nullsLast());
			break;
		case 'created':
			select = select.orderBy('episode.createdAt', direction);
			break;
		default:
			select = select.orderBy(sql`episode.publish_date ${sql.raw(direction)} ${nulls}`);
	}
	const rows = await select.orderBy('episode.title').orderBy('episode.id').execute();
	return rows.map(({ scriptChanged, ...row }) => ({
		...row,
		scriptShown: shownScriptStatus(row.scriptStatus, scriptChanged),
		segmentCount: Number(row.segmentCount ?? 0),
		plannedSeconds: Number(row.plannedSeconds ?? 0)
	}));
}

export type EpisodeListRow = Awaited<ReturnType<typeof listEpisodes>>[number];
