import { json } from '@sveltejs/kit';
import { api, parseWith, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { createPart, searchParts } from '$lib/server/merch/parts';
import { partCreateSchema, partSearchSchema } from '$lib/schemas/parts';
import type { RequestHandler } from './$types';

/**
 * Any crew member searches the catalogue: `?q=&category=&status=&sort=&dir=&page=&pageSize=`.
 * Server-Timing `total` is the time inside the handler (read by scripts/bench-parts.ts).
 */
export const GET: RequestHandler = api(async (event) => {
	const started = performance.now();
	const { channel } = requireRole(event);
	const query = parseWith(partSearchSchema, Object.fromEntries(event.url.searchParams));
	const page = await searchParts(channel.id, query);
	return json(page, {
		headers: {
			'cache-control': 'private, no-store',
			'server-timing': `total;dur=${(performance.now() - started).toFixed(3)}`
		}
	});
});

/** The merch team (or the producer) adds a part. */
export const POST: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'merch', 'producer');
	const input = await readJson(event, partCreateSchema);
	return json({ part: await createPart(channel.id, input) }, { status: 201 });
});
