/**
 * The episode picker's search: a few episodes of the channel whose title holds the typed words,
 * so a form that links to another episode (a teaser's follow-up) never loads the whole channel.
 * The form shows its current value from its own row; the picker only fetches candidates.
 */
import { sql } from 'kysely';
import { db } from '../db';
import { isUuid } from '../auth/identity';
import type { EpisodePickerQuery } from '$lib/schemas/episodes';

export interface EpisodeChoice {
	id: string;
	title: string;
	stage: string;
}

/** `%`, `_` and `\` typed into a search are searched for, not used as LIKE wildcards. */
const escapeLike = (text: string) => text.replace(/[\\%_]/g, '\\$&');

/** Episodes of the channel whose title holds every typed word, by title; at most `limit`. */
export async function pickEpisodes(
	channelId: string,
	query: EpisodePickerQuery
): Promise<EpisodeChoice[]> {
	let select = db
		.selectFrom('episode')
		.select(['episode.id', 'episode.title', 'episode.stage'])
		.where('episode.channelId', '=', channelId);
	for (const word of (query.q ?? '').split(/\s+/).filter(Boolean).slice(0, 6))
		select = select.where(
			sql<string>`lower(episode.title)`,
			'like',
			sql<string>`lower(${`%${escapeLike(word)}%`})`
		);
	// A page passes its own episode id from the address; one that is no id excludes nothing.
	if (query.except && isUuid(query.except)) select = select.where('episode.id', '!=', query.except);
	return select
		.orderBy(sql`lower(episode.title)`)
		.orderBy('episode.id')
		.limit(query.limit)
		.execute();
}
