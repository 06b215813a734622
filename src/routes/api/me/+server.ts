import { json } from '@sveltejs/kit';
import { api } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api(async (event) => {
	const { person, channel, roles } = requireRole(event);
	return json({ person, channel, roles, channels: event.locals.channels, via: event.locals.via });
});
