import { requireRole } from '$lib/server/guard';
import type { PageServerLoad } from './$types';

/** The CSV import: the merch team and the producer only. The page talks to /api/parts/import. */
export const load = (async (event) => {
	requireRole(event, 'merch', 'producer');
	return {};
}) satisfies PageServerLoad;
