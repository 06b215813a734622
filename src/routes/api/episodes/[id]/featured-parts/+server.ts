import { json } from '@sveltejs/kit';
import { api } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { featuredPartsFor } from '$lib/server/merch/featured-parts';
import type { RequestHandler } from './$types';

/** Any crew member reads the featured parts list (first appearance order) and its warnings. */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	return json(await featuredPartsFor(channel.id, event.params.id));
});
