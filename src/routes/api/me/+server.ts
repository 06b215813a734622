import { json } from '@sveltejs/kit';
import { api } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api(async (event) => {
	const { person, channel, roles } = requireRole(event);
	return json({ person, channel, roles, channels: event.locals.channels, via: event.locals.via });
});
