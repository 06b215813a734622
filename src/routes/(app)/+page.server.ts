import { requireRole } from '$lib/server/guard';
import { benchFor } from '$lib/server/bench';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel, roles, person } = requireRole(event);
	return { bench: await benchFor(channel.id, roles, person.id) };
}) satisfies PageServerLoad;
