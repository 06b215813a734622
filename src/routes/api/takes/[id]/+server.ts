import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { deleteTake, updateTake } from '$lib/server/shoot/takes';
import { takeUpdateSchema } from '$lib/schemas/takes';
import type { RequestHandler } from './$types';

export const PATCH: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'camera', 'producer');
	const input = await readJson(event, takeUpdateSchema);
	return json({ take: await updateTake(channel.id, event.params.id, input) });
});

export const DELETE: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'camera', 'producer');
	await deleteTake(channel.id, event.params.id);
	return new Response(null, { status: 204 });
});
