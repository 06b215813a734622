import { json } from '@sveltejs/kit';
import { api, parseWith, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { commitPartImport } from '$lib/server/merch/parts-import';
import { previewPartImport } from '$lib/server/merch/parts-import-preview';
import { importRequestSchema, type ImportRequest } from '$lib/schemas/parts';
import type { RequestHandler } from './$types';

/**
 * The merch team (or the producer) imports a CSV file.
 * JSON body `{ action: 'preview' | 'commit', mode: 'create' | 'update', csv, mapping? }`, or the
 * file itself as `text/csv` with `?action=&mode=` for tools. Preview writes nothing; commit writes
 * every row in one transaction or answers 422 with the errors by row and writes nothing.
 */
export const POST: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'merch', 'producer');
	let request: ImportRequest;
	if ((event.request.headers.get('content-type') ?? '').startsWith('text/csv')) {
		const params = Object.fromEntries(event.url.searchParams);
		request = parseWith(importRequestSchema, {
			action: params.action ?? 'preview',
			mode: params.mode ?? 'create',
			csv: await event.request.text()
		});
	} else {
		request = await readJson(event, importRequestSchema);
	}
	if (request.action === 'preview')
		return json({ preview: await previewPartImport(channel.id, request) });
	return json({ result: await commitPartImport(channel.id, request) });
});
