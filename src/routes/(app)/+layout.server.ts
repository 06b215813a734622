import { requireRole } from '$lib/server/auth/guard';
import type { LayoutServerLoad } from './$types';

export const load = (async (event) => {
	const { person, channel, roles } = requireRole(event);
	return { person, channel, roles, channels: event.locals.channels };
}) satisfies LayoutServerLoad;
