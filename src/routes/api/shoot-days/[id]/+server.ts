import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { deleteShootDay, shootDayDetail, updateShootDay } from '$lib/server/shoot/shoot-days';
import { shootDayUpdateSchema } from '$lib/schemas/shoot';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	return json(await shootDayDetail(channel.id, event.params.id));
});

export const PATCH: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'producer', 'camera');
	const input = await readJson(event, shootDayUpdateSchema);
	return json({ shootDay: await updateShootDay(channel.id, event.params.id, input) });
});

export const DELETE: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'producer');
	await deleteShootDay(channel.id, event.params.id);
	return new Response(null, { status: 204 });
});
