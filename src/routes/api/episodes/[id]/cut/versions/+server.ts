import { json } from '@sveltejs/kit';
import { api } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { cutVersionsFor } from '$lib/server/edit/cut-versions';
import { cutCommentsFor } from '$lib/server/edit/cut-comments';
import { requestEpisode } from '$lib/server/episodes/request-episode';
import type { RequestHandler } from './$types';

/** The cut's versions (newest, the current one, first) and every comment on them; any crew member reads. */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	await requestEpisode(event.locals, channel.id, event.params.id);
	const [versions, comments] = await Promise.all([
		cutVersionsFor(channel.id, event.params.id),
		cutCommentsFor(channel.id, event.params.id)
	]);
	return json({ versions, comments });
});
