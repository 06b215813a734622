import { hasRole, requireRole } from '$lib/server/auth/guard';
import { partCategories, searchParts } from '$lib/server/merch/parts';
import { partSearchSchema } from '$lib/schemas/parts';
import type { PageServerLoad } from './$types';

/**
 * The catalogue table. The first page comes with the page (and works without JavaScript as a GET
 * form); typing, sorting and paging then fetch /api/parts. Everyone reads; merch and the producer edit.
 */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	const parsed = partSearchSchema.safeParse(Object.fromEntries(event.url.searchParams));
	const query = parsed.success ? parsed.data : partSearchSchema.parse({});
	const [page, categories] = await Promise.all([
		searchParts(channel.id, query),
		partCategories(channel.id)
	]);
	return {
		page,
		categories,
		canEdit: hasRole(event.locals, 'merch', 'producer'),
		searchProblem: parsed.success ? null : (parsed.error.issues[0]?.message ?? null)
	};
}) satisfies PageServerLoad;
