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
import {
	keysetAfter,
	keysetOrderBy,
	keysetPage,
	keysetSelections,
	type SortKey
} from '../http/keyset';

/**
 * Every sort key below is also an index of migrations/2026-12-04-20-list-sorts.ts (and
 * 2026-12-03-40-paging-indexes.ts for the default order), so a page reads its rows from an index
 * in order: change a key here and the index's expression must change with it.
 */
const stageOrder = sql<number>`array_position(ARRAY[${sql.join(STAGES.map((stage) => sql.lit(stage)))}]::text[], episode.stage)`;

/**
 * One page of the episode list with filters and sort (keyset-paged: `query.after` is the cursor of
 * the previous page's last row); each row carries what the list shows at a glance.
 */
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
	const order = `${query.sort}:${query.direction}`;
	const keys = sortKeys(query);
	const rows = await select
		.select(keysetSelections(keys))
		.where(keysetAfter(order, keys, query.after))
		.orderBy(keysetOrderBy(keys))
		.limit(query.limit + 1)
		.execute();
	const page = keysetPage(order, keys, rows, query.limit);
	return {
		next: page.next,
		items: page.items.map(({ scriptChanged, ...row }) => ({
			...row,
			scriptShown: shownScriptStatus(row.scriptStatus, scriptChanged),
			segmentCount: Number(row.segmentCount ?? 0),
			plannedSeconds: Number(row.plannedSeconds ?? 0)
		}))
	};
}

/** A publish date, with "no date yet" after every date. */
const publishKey = sql`coalesce(episode.publish_date, 'infinity'::date)`;

/**
 * The list's order as keyset sort keys: the chosen sort, then the title, then the id, so episodes
 * with the same date or stage still come in one stable order across pages. Episodes without a
 * publish date come last going up and first going down.
 */
function sortKeys(query: EpisodeListQuery): SortKey[] {
	const direction = query.direction;
	const tail: SortKey[] = [
		{ expression: sql`episode.title`, direction: 'asc', kind: 'text' },
		{ expression: sql`episode.id`, direction: 'asc', kind: 'uuid' }
	];
	switch (query.sort) {
		case 'title':
			return [{ expression: sql`lower(episode.title)`, direction, kind: 'text' }, ...tail];
		case 'stage':
			return [
				{ expression: stageOrder, direction, kind: 'integer' },
				{ expression: publishKey, direction: 'asc', kind: 'date' },
				...tail
			];
		case 'created':
			return [{ expression: sql`episode.created_at`, direction, kind: 'timestamp' }, ...tail];
		default:
			return [{ expression: publishKey, direction, kind: 'date' }, ...tail];
	}
}

export type EpisodeListRow = Awaited<ReturnType<typeof listEpisodes>>['items'][number];
