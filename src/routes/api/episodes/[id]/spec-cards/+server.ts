import { json } from '@sveltejs/kit';
import { DomainError, api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { createSpecCard, specCardDownloadFor, specCardsFor } from '$lib/server/edit/spec-cards';
import { specCardCreateSchema, specCardExportFormatSchema } from '$lib/schemas/spec-cards';
import type { RequestHandler } from './$types';
import { attachment } from '$lib/server/http/attachment';

/**
 * Any crew member reads the spec cards. Without `format`: the episode's cards with their lines as
 * they read on screen, and its segments. With `?format=csv|json`: the export for the editor's
 * graphics as a download.
 */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const format = event.url.searchParams.get('format');
	if (format === null) return json(await specCardsFor(channel.id, event.params.id));

	const wanted = specCardExportFormatSchema.safeParse(format);
	if (!wanted.success) {
		const message = `“${format}” isn't a spec-card export format; ask for csv or json.`;
		throw new DomainError(400, message, { format: [message] });
	}
	const download = await specCardDownloadFor(channel.id, event.params.id, wanted.data);
	return attachment(download.body, download);
});

/** The editor or the producer adds a card; its numbers are checked by the spec parsers (400 with their words). */
export const POST: RequestHandler = api(async (event) => {
	const { channel, person } = requireRole(event, 'editor', 'producer');
	const input = await readJson(event, specCardCreateSchema);
	return json(await createSpecCard(channel.id, person, event.params.id, input), { status: 201 });
});
