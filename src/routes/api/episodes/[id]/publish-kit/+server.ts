import { json } from '@sveltejs/kit';
import { api, parseWith } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { attachment } from '$lib/server/http/attachment';
import { publishKitFor, renderKit } from '$lib/server/merch/publish-kit';
import { kitFormatSchema } from '$lib/schemas/parts';
import type { RequestHandler } from './$types';

/**
 * Any crew member reads the publish kit. Without `format`: the kit as JSON. With
 * `?format=md|txt|json`: that file, as a download. Server-Timing `total` is the handler's time.
 */
export const GET: RequestHandler = api(async (event) => {
	const started = performance.now();
	const { channel } = requireRole(event);
	const format = event.url.searchParams.get('format');
	const kit = await publishKitFor(channel.id, event.params.id, { origin: event.url.origin });
	const timing = {
		'cache-control': 'private, no-store',
		'server-timing': `total;dur=${(performance.now() - started).toFixed(3)}`
	};
	if (format === null) return json(kit, { headers: timing });
	const file = renderKit(kit, parseWith(kitFormatSchema, format));
	return attachment(
		file.body,
		{
			contentType: file.contentType,
			filename: `${kit.episode.slug}-publish-kit.${file.extension}`
		},
		timing
	);
});
