import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import { Readable } from 'node:stream';
import parseRange from 'range-parser';
import { api, DomainError } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { footageFile } from '$lib/server/footage/footage';
import { INLINE_TYPE } from '$lib/upload-rules';
import type { RequestHandler } from './$types';

/**
 * Serves a clip with HTTP range requests (RFC 9110 §14) so a video element can seek:
 * 206 with Content-Range for a satisfiable range, 416 otherwise, 200 for the whole file.
 */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const file = await footageFile(channel.id, event.params.footageId);
	const size = await stat(file.path).then(
		(info) => info.size,
		() => {
			throw new DomainError(
				404,
				'The file behind this clip is not on the server (demo data, or removed from disk).'
			);
		}
	);
	// The type was the uploader's word. Only media a browser plays or shows in place is served as
	// that type and inline; anything else is a plain download. Either way the browser may not
	// guess another type (nosniff), and a file opened on its own runs no script (CSP sandbox).
	const inline = INLINE_TYPE.test(file.fileType);
	const headers: Record<string, string> = {
		'Content-Type': inline ? file.fileType : 'application/octet-stream',
		'Accept-Ranges': 'bytes',
		'Content-Disposition': `${inline && !event.url.searchParams.has('download') ? 'inline' : 'attachment'}; filename*=UTF-8''${encodeURIComponent(file.fileName)}`,
		'Cache-Control': 'private, max-age=3600',
		'X-Content-Type-Options': 'nosniff',
		'Content-Security-Policy': "sandbox; default-src 'none'"
	};
	const rangeHeader = event.request.headers.get('range');
	if (rangeHeader) {
		const ranges = parseRange(size, rangeHeader, { combine: true });
		if (ranges === -1)
			return new Response(null, {
				status: 416,
				headers: { ...headers, 'Content-Range': `bytes */${size}` }
			});
		if (ranges !== -2 && ranges.type === 'bytes' && ranges.length === 1) {
			const { start, end } = ranges[0];
			const body = Readable.toWeb(createReadStream(file.path, { start, end })) as ReadableStream;
			return new Response(body, {
				status: 206,
				headers: {
					...headers,
					'Content-Range': `bytes ${start}-${end}/${size}`,
					'Content-Length': String(end - start + 1)
				}
			});
		}
	}
	const body = Readable.toWeb(createReadStream(file.path)) as ReadableStream;
	return new Response(body, {
		status: 200,
		headers: { ...headers, 'Content-Length': String(size) }
	});
});
