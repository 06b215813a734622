import { requireRole } from '$lib/server/auth/guard';
import { listFollowUps } from '$lib/server/episodes/follow-ups';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event);
	return { followUps: await listFollowUps(channel.id) };
}) satisfies PageServerLoad;
