import { requireRole } from '$lib/server/auth/guard';
import { worklistFor } from '$lib/server/home/worklist';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel, roles, person } = requireRole(event);
	return { worklist: await worklistFor(channel.id, roles, person.id) };
}) satisfies PageServerLoad;
