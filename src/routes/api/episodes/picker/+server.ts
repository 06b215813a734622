import { json } from '@sveltejs/kit';
import { api, parseWith } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { pickEpisodes } from '$lib/server/episodes/episode-picker';
import { episodePickerQuerySchema } from '$lib/schemas/episodes';
import type { RequestHandler } from './$types';

/**
 * The episode picker asks as the person types: `?q=<words of the title>&except=<id>&limit=`, the
 * channel's episodes only, `{ items: [{ id, title, stage }] }`. Every crew member may search (any
 * of them can see the episode list).
 */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const query = parseWith(episodePickerQuerySchema, Object.fromEntries(event.url.searchParams));
	return json(
		{ items: await pickEpisodes(channel.id, query) },
		{ headers: { 'cache-control': 'private, no-store' } }
	);
});
