import { requireRole } from '$lib/server/auth/guard';
import { episodeInChannel } from '$lib/server/episodes/episodes';
import { forPage } from '$lib/server/http/forms';
import type { LayoutServerLoad } from './$types';

/** The header every episode page shares: title, stage, and the tabs. 404 for another channel's episode. */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	const episode = await forPage(episodeInChannel(channel.id, event.params.id));
	return {
		episodeHeader: {
			id: episode.id,
			title: episode.title,
			stage: episode.stage,
			slug: episode.slug
		}
	};
}) satisfies LayoutServerLoad;
