import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { logTake } from '$lib/server/shoot/takes';
import { takeCreateSchema } from '$lib/schemas/takes';
import type { RequestHandler } from './$types';

/** The camera operator (or a producer) logs a take against a shot. */
export const POST: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'camera', 'producer');
	const input = await readJson(event, takeCreateSchema);
	return json({ take: await logTake(channel.id, event.params.id, input) }, { status: 201 });
});
