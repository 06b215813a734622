/** Upload limits and names shared by the browser uploader and the server. */
export const UPLOAD_PATH = '/api/uploads';
/**
 * Each PATCH carries at most this much, below the server's 40 MiB request body limit (BODY_SIZE_LIMIT).
 * Fewer, larger chunks keep per-request costs (session check, upload lookup) small next to the bytes:
 * see scripts/bench-uploads.ts.
 */
export const UPLOAD_CHUNK_BYTES = 32 * 1024 * 1024;
/** The request body limit the start command and the tests give adapter-node. */
export const BODY_SIZE_LIMIT_BYTES = 40 * 1024 * 1024;
/** Default largest upload: 50 GiB (an hour of high-bitrate rushes), configurable with MAX_UPLOAD_BYTES. */
export const DEFAULT_MAX_UPLOAD_BYTES = 50 * 1024 ** 3;
/**
 * Footage, sound and stills only. Image types that are documents with markup (SVG and any other
 * `+xml` type) can carry scripts, so they are refused.
 */
export const ALLOWED_UPLOAD_TYPE =
	/^(?:video|audio|image)\/(?![a-z0-9.+-]*(?:svg|xml))[a-z0-9.+-]+$/i;

/** Types a browser may show in place (the player, a still); anything else is served as a download. */
export const INLINE_TYPE =
	/^(?:video|audio)\/[a-z0-9.+-]+$|^image\/(?:jpeg|png|gif|webp|avif|heic|heif)$/i;

/** A file name safe to store and show: no folders, no control characters, no leading dots, at most 120 characters. */
export function cleanFileName(name: string): string {
	const base = name.replace(/\\/g, '/').split('/').pop() ?? '';
	const cleaned = base
		.normalize('NFC')
		.replace(/[\u0000-\u001f\u007f<>:"|?*]/g, '')
		.replace(/\s+/g, ' ')
		.replace(/^[.\s]+/, '')
		.trim();
	if (cleaned.length <= 120) return cleaned || 'clip';
	const dot = cleaned.lastIndexOf('.');
	const extension = dot > 0 && cleaned.length - dot <= 10 ? cleaned.slice(dot) : '';
	return cleaned.slice(0, 120 - extension.length) + extension;
}
