/**
 * The session id inside Auth.js's session cookie. Decoding the cookie derives its key (HKDF) and
 * decrypts the JWE, about 7 % of a page's CPU when done on every request; the same cookie decodes
 * to the same value until it expires, so a decoded cookie is remembered until then (five minutes
 * at most). The cookie only names a session: every request still reads that session's row, so a
 * signed-out or deleted session loses access at once.
 */
import { getToken } from '@auth/core/jwt';

const REMEMBER_MS = 5 * 60_000;
const MOST_REMEMBERED = 5_000;
const decoded = new Map<string, { sessionId: string; until: number }>();

/** Auth.js's cookie name (chunked cookies carry a `.0`, `.1` … suffix). */
const cookieName = (secure: boolean) =>
	secure ? '__Secure-authjs.session-token' : 'authjs.session-token';

export async function sessionIdFromCookie(
	request: Request,
	secret: string | undefined,
	secure: boolean
): Promise<string | undefined> {
	const name = cookieName(secure);
	const parts = (request.headers.get('cookie') ?? '')
		.split(/;\s*/)
		.filter((cookie) => cookie.startsWith(`${name}=`) || cookie.startsWith(`${name}.`))
		.sort();
	if (parts.length === 0 || !secret) return undefined;
	const key = parts.join(';');
	const now = Date.now();
	const known = decoded.get(key);
	if (known && known.until > now) return known.sessionId;
	if (known) decoded.delete(key);

	// A forged, stale or expired cookie decodes to null: simply no session (and nothing remembered).
	const token = await getToken({ req: request, secret, secureCookie: secure }).catch(() => null);
	if (typeof token?.sid !== 'string') return undefined;
	const expires = typeof token.exp === 'number' ? token.exp * 1000 : now;
	if (expires > now) {
		if (decoded.size >= MOST_REMEMBERED) decoded.delete(decoded.keys().next().value as string);
		decoded.set(key, { sessionId: token.sid, until: Math.min(expires, now + REMEMBER_MS) });
	}
	return token.sid;
}
