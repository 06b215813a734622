import { json } from '@sveltejs/kit';
import { DomainError, api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import {
	confirmMarkerImport,
	markerDownloadFor,
	previewMarkerImport
} from '$lib/server/edit/markers';
import { markerFormatSchema, markerImportSchema } from '$lib/schemas/markers';
import type { RequestHandler } from './$types';
import { attachment } from '$lib/server/http/attachment';

/**
 * Any crew member downloads the markers for the edit system: `?format=edl` (CMX 3600) or
 * `?format=otio` (OpenTimelineIO), chapters, caution cards, spec cards and open review comments at programme timecode.
 */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const format = event.url.searchParams.get('format') ?? '';
	const wanted = markerFormatSchema.safeParse(format);
	if (!wanted.success) {
		const message = `“${format}” isn't a marker format; ask for edl or otio.`;
		throw new DomainError(400, message, { format: [message] });
	}
	const download = await markerDownloadFor(channel.id, event.params.id, wanted.data);
	return attachment(download.body, download);
});

/**
 * The editor or the producer imports chapter markers from an edit system's file: without
 * `confirm` the answer is the preview (nothing written); with `confirm: true` and the preview's
 * `basis` the changes are written. A file with bad rows answers 422 with `rows`.
 */
export const POST: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'editor', 'producer');
	const input = await readJson(event, markerImportSchema);
	if (!input.confirm)
		return json({ preview: await previewMarkerImport(channel.id, event.params.id, input) });
	return json(await confirmMarkerImport(channel.id, event.params.id, input));
});
