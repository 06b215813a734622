import { json } from '@sveltejs/kit';
import { DomainError, api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { addChapter, editStateFor } from '$lib/server/edit/edit';
import { chapterDownloadFor } from '$lib/server/edit/chapter-download';
import { chapterCreateSchema, chapterFormatSchema } from '$lib/schemas/edit';
import type { RequestHandler } from './$types';
import { attachment } from '$lib/server/http/attachment';

/**
 * Any crew member reads the chapters. Without `format`: the edit state as JSON, with the rule
 * violations per chapter. With `?format=txt|vtt|ffmetadata|json|csv`: the export as a download.
 */
export const GET: RequestHandler = api(async (event) => {
	const started = performance.now();
	const { channel } = requireRole(event);
	const format = event.url.searchParams.get('format');
	if (format === null) return json(await editStateFor(channel.id, event.params.id));

	const wanted = chapterFormatSchema.safeParse(format);
	if (!wanted.success) {
		const message = `“${format}” isn't a chapter export format; ask for txt, vtt, ffmetadata, json or csv.`;
		throw new DomainError(400, message, { format: [message] });
	}
	const download = await chapterDownloadFor(channel.id, event.params.id, wanted.data);
	const { queryMilliseconds, renderMilliseconds } = download.timing;
	return attachment(download.body, download, {
		// Server-side time inside this handler (the auth hooks before it are not included); read by scripts/bench.ts.
		'server-timing': `db;dur=${queryMilliseconds.toFixed(3)};desc="1 query", render;dur=${renderMilliseconds.toFixed(3)}, total;dur=${(performance.now() - started).toFixed(3)}`
	});
});

/** The editor or the producer adds a chapter, at a typed time (`start`) or a frame (`startFrame`). */
export const POST: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'editor', 'producer');
	const input = await readJson(event, chapterCreateSchema);
	return json(await addChapter(channel.id, event.params.id, input), { status: 201 });
});
