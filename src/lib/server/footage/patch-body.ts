/**
 * What a tus PATCH must satisfy before its body reaches tus, so a refused request changes nothing:
 * the tus 1.0.0 content type (else 415, as the core protocol says), and at most the server's
 * request body limit (else 413). A PATCH with a Content-Length is judged by it. A chunked one
 * (no length) is first written to a spool file, counting bytes, and handed on with its length only
 * once it has arrived whole and within the limit; otherwise tus would store the bytes up to the
 * limit and still answer an error.
 */
import { randomBytes } from 'node:crypto';
import { createReadStream, createWriteStream } from 'node:fs';
import { mkdir, rm } from 'node:fs/promises';
import path from 'node:path';
import { Readable } from 'node:stream';
import { finished } from 'node:stream/promises';
import { once } from 'node:events';

export const PATCH_CONTENT_TYPE = 'application/offset+octet-stream';

/** adapter-node's BODY_SIZE_LIMIT, read the way adapter-node reads it (512K when unset; K, M, G suffixes). */
export function bodySizeLimit(value = '512K'): number {
	const multiplier =
		{ K: 1024, M: 1024 ** 2, G: 1024 ** 3 }[value.at(-1)?.toUpperCase() ?? ''] ?? 1;
	return Number(multiplier === 1 ? value : value.slice(0, -1)) * multiplier;
}

export type CheckedPatch =
	| { refused: { status: 400 | 413 | 415; message: string } }
	| { request: Request; release: () => Promise<void> };

const tooLarge = (limit: number) => ({
	refused: {
		status: 413 as const,
		message: `That PATCH is larger than the server takes in one request (${limit} bytes). Send the file in smaller chunks; the upload's offset is unchanged.`
	}
});

/** Checks a PATCH; on success answers the request to hand to tus and a `release` to call after it. */
export async function checkPatchBody(
	request: Request,
	limit: number,
	spoolDir: string
): Promise<CheckedPatch> {
	const type = request.headers.get('content-type')?.split(';')[0].trim().toLowerCase();
	if (type !== PATCH_CONTENT_TYPE)
		return {
			refused: {
				status: 415,
				message: `A PATCH must send its bytes as Content-Type: ${PATCH_CONTENT_TYPE} (tus 1.0.0).`
			}
		};
	const declared = request.headers.get('content-length');
	if (declared !== null || !request.body) {
		if (Number(declared) > limit) return tooLarge(limit);
		return { request, release: async () => {} };
	}

	await mkdir(spoolDir, { recursive: true });
	const file = path.join(spoolDir, randomBytes(16).toString('hex'));
	const out = createWriteStream(file, { flags: 'wx' });
	const written = finished(out);
	written.catch(() => {}); // awaited below; a disk error must not go unhandled meanwhile
	const reader = request.body.getReader();
	let size = 0;
	let outcome: 'whole' | 'too large' | 'broken' = 'whole';
	try {
		for (;;) {
			const { done, value } = await reader.read();
			if (done) break;
			size += value.byteLength;
			if (size > limit) {
				outcome = 'too large';
				// Read the rest and drop it, so the answer reaches a client that is still sending.
				void (async () => {
					while (!(await reader.read()).done);
				})().catch(() => {});
				break;
			}
			if (!out.write(value)) await Promise.race([once(out, 'drain'), written]);
		}
	} catch (failure) {
		// adapter-node fails the body stream with a 413 once it passes BODY_SIZE_LIMIT; anything else
		// is a client that went away mid-body.
		outcome = (failure as { status?: unknown })?.status === 413 ? 'too large' : 'broken';
	}
	out.end();
	try {
		await written;
	} catch (failure) {
		await rm(file, { force: true });
		throw failure;
	}
	if (outcome !== 'whole') {
		await rm(file, { force: true });
		return outcome === 'too large'
			? tooLarge(limit)
			: {
					refused: {
						status: 400,
						message: 'The PATCH body did not arrive whole; nothing of it was stored.'
					}
				};
	}
	const headers = new Headers(request.headers);
	headers.delete('transfer-encoding');
	headers.set('content-length', String(size));
	return {
		request: new Request(request.url, {
			method: request.method,
			headers,
			body: Readable.toWeb(createReadStream(file)) as ReadableStream,
			// @ts-expect-error undici needs this for a streamed body; the DOM RequestInit type lacks it
			duplex: 'half'
		}),
		release: () => rm(file, { force: true })
	};
}
