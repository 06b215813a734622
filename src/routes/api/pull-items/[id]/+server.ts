import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { setPullOnHand } from '$lib/server/shoot/day-items';
import { onHandSchema } from '$lib/schemas/shoot';
import type { RequestHandler } from './$types';

/** The merch team (or a producer) ticks a pull-list item as on hand. */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel, person } = requireRole(event, 'merch', 'producer');
	const { onHand, version } = await readJson(event, onHandSchema);
	return json({
		item: await setPullOnHand(channel.id, event.params.id, person.id, onHand, version)
	});
});
