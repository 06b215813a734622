/**
 * A stored file (footage/object-store.ts) as an HTTP answer, after the route has checked the
 * caller's sign-in, role and channel. On disk the app serves it with range requests
 * (file-response.ts); in a bucket it answers 302 to a short-lived presigned GET address, and the
 * browser sends its Range (RFC 9110 §14) straight to the store. The headers the app would have
 * sent (type, disposition, cache) travel in the signed address as the store's response overrides.
 */
import path from 'node:path';
import { DomainError } from './api';
import { fileResponse } from './file-response';
import { configuredBucket, storeOf, type StoredIn } from '../footage/object-store';
import type { BucketStore } from '../footage/bucket-store';
import { uploadDir } from '../footage/tus-server';

export interface StoredFile {
	storedIn: StoredIn;
	key: string;
	/** What a caller reads when the file is not there. */
	missing: string;
}

export async function storedFileResponse(
	file: StoredFile,
	request: Request,
	headers: Record<string, string>
): Promise<Response> {
	let store;
	try {
		store = storeOf(file.storedIn);
	} catch {
		throw new DomainError(
			404,
			'This file is in object storage, and this server has no object storage settings.'
		);
	}
	if (store.kind === 'bucket') {
		const url = await (store as BucketStore).signedUrl(file.key, {
			type: headers['Content-Type'] ?? 'application/octet-stream',
			disposition: headers['Content-Disposition'] ?? 'attachment',
			cacheControl: headers['Cache-Control'] ?? 'private, max-age=3600'
		});
		// The address expires: neither the browser nor a cache keeps the redirect itself.
		return new Response(null, {
			status: 302,
			headers: { Location: url, 'Cache-Control': 'private, no-store' }
		});
	}
	const size = await store.size(file.key);
	if (size === null) throw new DomainError(404, file.missing);
	return fileResponse(path.join(uploadDir(), file.key), size, request, headers);
}

/**
 * Pages may play and show media from the bucket: with object storage set up, a page's
 * Content-Security-Policy (kit.csp in svelte.config.js, where `default-src 'self'` covers media and
 * images) gets `media-src` and `img-src` naming the bucket's origin too, since the proxy, poster
 * and sprite addresses redirect there. Nothing changes without a bucket.
 */
export function withBucketMedia(response: Response): Response {
	const policy = response.headers.get('content-security-policy');
	if (!policy || !(response.headers.get('content-type') ?? '').startsWith('text/html'))
		return response;
	const bucket = configuredBucket();
	if (!bucket) return response;
	response.headers.set(
		'content-security-policy',
		`${policy}; media-src 'self' ${bucket.origin}; img-src 'self' ${bucket.origin}`
	);
	return response;
}
