import { storedFileResponse } from '$lib/server/http/object-response';
import { api } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { footageFile } from '$lib/server/footage/footage';
import { INLINE_TYPE } from '$lib/upload-rules';
import type { RequestHandler } from './$types';

/**
 * Serves a clip with HTTP range requests (http/file-response.ts) so a video element can seek, or
 * redirects to a short-lived address in the bucket holding it (http/object-response.ts).
 */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const file = await footageFile(channel.id, event.params.footageId);
	// The type was the uploader's word. Only media a browser plays or shows in place is served as
	// that type and inline; anything else is a plain download. Either way the browser may not
	// guess another type (nosniff), and a file opened on its own runs no script (CSP sandbox).
	const inline = INLINE_TYPE.test(file.fileType);
	const headers: Record<string, string> = {
		'Content-Type': inline ? file.fileType : 'application/octet-stream',
		'Content-Disposition': `${inline && !event.url.searchParams.has('download') ? 'inline' : 'attachment'}; filename*=UTF-8''${encodeURIComponent(file.fileName)}`,
		'Cache-Control': 'private, max-age=3600',
		'X-Content-Type-Options': 'nosniff',
		'Content-Security-Policy': "sandbox; default-src 'none'"
	};
	return storedFileResponse(file.stored, event.request, headers);
});
