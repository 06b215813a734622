import { requireRole } from '$lib/server/auth/guard';
import { requestEpisode } from '$lib/server/episodes/request-episode';
import { forPage } from '$lib/server/http/forms';
import type { LayoutServerLoad } from './$types';

/** The header every episode page shares: title, stage, and the tabs. 404 for another channel's episode. */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	// Shared with the page's load in the same request (request-episode.ts): the row is read once.
	const episode = await forPage(requestEpisode(event.locals, channel.id, event.params.id));
	return {
		episodeHeader: {
			id: episode.id,
			title: episode.title,
			stage: episode.stage,
			slug: episode.slug
		}
	};
}) satisfies LayoutServerLoad;
