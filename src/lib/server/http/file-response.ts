/**
 * A file on disk as an HTTP answer with range requests (RFC 9110 §14), so a video element can
 * seek: 206 with Content-Range for one satisfiable range, 416 for an unsatisfiable one, 200 with
 * the whole file otherwise (several ranges included: answering the whole file is allowed).
 */
import { createReadStream } from 'node:fs';
import { Readable } from 'node:stream';
import parseRange from 'range-parser';

export function fileResponse(
	file: string,
	size: number,
	request: Request,
	headers: Record<string, string>
): Response {
	const base = { ...headers, 'Accept-Ranges': 'bytes' };
	const rangeHeader = request.headers.get('range');
	if (rangeHeader) {
		const ranges = parseRange(size, rangeHeader, { combine: true });
		if (ranges === -1)
			return new Response(null, {
				status: 416,
				headers: { ...base, 'Content-Range': `bytes */${size}` }
			});
		if (ranges !== -2 && ranges.type === 'bytes' && ranges.length === 1) {
			const { start, end } = ranges[0];
			const body = Readable.toWeb(createReadStream(file, { start, end })) as ReadableStream;
			return new Response(body, {
				status: 206,
				headers: {
					...base,
					'Content-Range': `bytes ${start}-${end}/${size}`,
					'Content-Length': String(end - start + 1)
				}
			});
		}
	}
	const body = Readable.toWeb(createReadStream(file)) as ReadableStream;
	return new Response(body, {
		status: 200,
		headers: { ...base, 'Content-Length': String(size) }
	});
}
