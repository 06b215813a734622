import { json } from '@sveltejs/kit';
import { api, parseWith } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { storageView } from '$lib/server/footage/storage';
import { maxUploadBytes } from '$lib/server/footage/tus-server';
import { storageQuerySchema } from '$lib/schemas/storage';
import type { RequestHandler } from './$types';

/** Any crew member may read what the current channel stores; only its own channel, never another's. */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const query = parseWith(storageQuerySchema, Object.fromEntries(event.url.searchParams));
	return json(await storageView(channel.id, maxUploadBytes(), query));
});
