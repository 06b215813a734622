/**
 * A made file (an export, a kit, a marker list) answered as a download: the browser saves it under
 * `filename` (RFC 6266) instead of showing it, never guesses another type (nosniff), and no cache
 * keeps a copy of a channel's data (private, no-store). `headers` adds or overrides fields.
 */
export function attachment(
	body: BodyInit,
	file: { contentType: string; filename: string },
	headers: Record<string, string> = {}
): Response {
	return new Response(body, {
		headers: {
			'content-type': file.contentType,
			'content-disposition': `attachment; filename="${file.filename}"`,
			'cache-control': 'private, no-store',
			'x-content-type-options': 'nosniff',
			...headers
		}
	});
}
