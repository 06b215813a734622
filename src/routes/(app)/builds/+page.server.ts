import { requireRole, hasRole } from '$lib/server/auth/guard';
import { listBuilds } from '$lib/server/episodes/builds';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event);
	return {
		builds: await listBuilds(channel.id),
		canEdit: hasRole(event.locals, 'producer', 'host')
	};
}) satisfies PageServerLoad;
