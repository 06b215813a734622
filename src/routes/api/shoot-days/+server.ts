import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { createShootDay, listShootDays } from '$lib/server/shoot/shoot-days';
import { shootDaySchema } from '$lib/schemas/shoot';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	return json({ shootDays: await listShootDays(channel.id) });
});

export const POST: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'producer', 'camera');
	const input = await readJson(event, shootDaySchema);
	return json({ shootDay: await createShootDay(channel.id, input) }, { status: 201 });
});
