import { requireRole } from '$lib/server/guard';
import { benchFor } from '$lib/server/bench';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel, roles } = requireRole(event);
	return { bench: await benchFor(channel.id, roles) };
}) satisfies PageServerLoad;
