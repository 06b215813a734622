/**
 * The one check for every redirect target that comes from a request (a `next` parameter, a form
 * field, a path): it returns a path on this site, or the fallback.
 *
 * A browser resolves a Location header with the WHATWG URL parser, which is generous: it drops
 * tabs and newlines anywhere, reads "\" as "/", and removes "." and ".." segments (also written
 * "%2e") after parsing, so "/..//evil.example" becomes "//evil.example", a protocol-relative
 * address of another host. So the target is resolved here the same way (Node's URL is that parser)
 * and only its normalised path, query and fragment are kept; and that result must itself still
 * resolve to this site, because it is what the browser will read.
 */

/** Longer targets are not real page addresses of this product; they are refused rather than trimmed. */
export const REDIRECT_TARGET_MAX = 2048;

// A placeholder origin: the target is resolved against it and must stay on it.
const BASE = 'http://wrenchroll.invalid';

// ASCII control characters and space: the URL parser strips or drops some of them, so a target
// holding any is not taken at face value. "\" is read as "/" in http(s) URLs.
const UNSAFE_CHARACTERS = /[\u0000-\u0020\u007f\\]/;

/** A local path (with query and fragment) to redirect to, or `fallback` when `target` could lead off the site. */
export function safeRedirectPath(target: unknown, fallback = '/'): string {
	if (typeof target !== 'string' || target.length === 0 || target.length > REDIRECT_TARGET_MAX)
		return fallback;
	if (UNSAFE_CHARACTERS.test(target)) return fallback;
	// Only a path: not "//host", not "scheme:…", not a relative "page".
	if (!target.startsWith('/') || target.startsWith('//')) return fallback;
	let resolved: URL;
	try {
		resolved = new URL(target, BASE);
	} catch {
		return fallback;
	}
	if (resolved.origin !== BASE) return fallback;
	const path = resolved.pathname + resolved.search + resolved.hash;
	// After dot segments are removed the path may start with "//" again ("/a/../..//host").
	if (path.startsWith('//') || path.length > REDIRECT_TARGET_MAX) return fallback;
	try {
		if (new URL(path, BASE).origin !== BASE) return fallback;
	} catch {
		return fallback;
	}
	return path;
}
