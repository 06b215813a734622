import { json } from '@sveltejs/kit';
import { api, parseWith, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { createEpisode } from '$lib/server/episodes/episodes';
import { listEpisodes } from '$lib/server/episodes/episode-list';
import { episodeCreateSchema, episodeListQuerySchema } from '$lib/schemas/episodes';
import type { RequestHandler } from './$types';

/**
 * Every crew member sees the episode list (filter with ?stage=&assignee=&from=&to=&sort=&direction=),
 * one page at a time: `{ items, next }`; `?after=<next>&limit=` asks for the following page.
 */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const query = parseWith(episodeListQuerySchema, Object.fromEntries(event.url.searchParams));
	return json(await listEpisodes(channel.id, query));
});

/** A producer creates an episode; it starts at the script stage. */
export const POST: RequestHandler = api(async (event) => {
	const { channel, person, roles } = requireRole(event, 'producer');
	const input = await readJson(event, episodeCreateSchema);
	return json(
		{ episode: await createEpisode(channel.id, { ...person, roles }, input, event.url.origin) },
		{ status: 201 }
	);
});
