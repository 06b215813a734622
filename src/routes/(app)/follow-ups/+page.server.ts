import { requireRole } from '$lib/server/guard';
import { listFollowUps } from '$lib/server/follow-ups';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event);
	return { followUps: await listFollowUps(channel.id) };
}) satisfies PageServerLoad;
