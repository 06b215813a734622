import { api } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { revokeToken } from '$lib/server/auth/tokens';
import type { RequestHandler } from './$types';

export const DELETE: RequestHandler = api(async (event) => {
	const { person, channel } = requireRole(event);
	await revokeToken(channel.id, person.id, event.params.id);
	return new Response(null, { status: 204 });
});
