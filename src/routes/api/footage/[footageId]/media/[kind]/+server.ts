import { z } from 'zod';
import { api, parseWith } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { mediaFile } from '$lib/server/media/outputs';
import { storedFileResponse } from '$lib/server/http/object-response';
import { MEDIA_KINDS } from '$lib/media';
import type { RequestHandler } from './$types';

const kindSchema = z.object({
	kind: z.enum(MEDIA_KINDS, { error: `Pick one of ${MEDIA_KINDS.join(', ')}.` })
});

/**
 * A clip's proxy, poster frame, thumbnail sprite or waveform peaks, with range requests (the
 * proxy seeks), or a redirect to the bucket holding them (http/object-response.ts). Made files
 * never change, so the browser may keep them for a day.
 */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const { kind } = parseWith(kindSchema, { kind: event.params.kind });
	const file = await mediaFile(channel.id, event.params.footageId, kind);
	return storedFileResponse(file.stored, event.request, {
		'Content-Type': file.type,
		'Content-Disposition': `inline; filename*=UTF-8''${encodeURIComponent(`${file.clipName}-${kind}${file.extension}`)}`,
		'Cache-Control': 'private, max-age=86400',
		'X-Content-Type-Options': 'nosniff',
		'Content-Security-Policy': "sandbox; default-src 'none'"
	});
});
