/**
 * The session-cookie reader remembers a decoded cookie, but never past the cookie's own expiry and
 * never for a cookie that does not decode. Cookies are made with Auth.js's own encoder (the library
 * that issues them in production), so the reader is checked against the real format.
 */
import { afterEach, expect, test, vi } from 'vitest';
import { encode } from '@auth/core/jwt';
import { sessionIdFromCookie } from '../../src/lib/server/auth/session-cookie';

const SECRET = 'unit-test-secret-0123456789abcdef0123456789';
const NAME = 'authjs.session-token';

async function cookieFor(sid: string, maxAge: number, secret = SECRET) {
	const value = await encode({ token: { sid }, secret, salt: NAME, maxAge });
	return new Request('http://127.0.0.1/', { headers: { cookie: `${NAME}=${value}; other=1` } });
}

afterEach(() => {
	vi.useRealTimers();
});

test('a valid cookie gives its session id, the same on a second read', async () => {
	const request = await cookieFor('session-a', 3600);
	expect(await sessionIdFromCookie(request, SECRET, false)).toBe('session-a');
	expect(await sessionIdFromCookie(request, SECRET, false)).toBe('session-a');
});

test('no cookie, a forged cookie, or one signed with another secret gives no session', async () => {
	expect(
		await sessionIdFromCookie(new Request('http://127.0.0.1/'), SECRET, false)
	).toBeUndefined();
	const forged = new Request('http://127.0.0.1/', { headers: { cookie: `${NAME}=not-a-jwe` } });
	expect(await sessionIdFromCookie(forged, SECRET, false)).toBeUndefined();
	const otherKey = await cookieFor('session-b', 3600, 'another-secret-0123456789abcdef012345');
	expect(await sessionIdFromCookie(otherKey, SECRET, false)).toBeUndefined();
});

test('a remembered cookie is forgotten once it expires', async () => {
	vi.useFakeTimers({ now: new Date('2026-12-03T06:00:00Z'), toFake: ['Date'] });
	const request = await cookieFor('session-c', 2);
	expect(await sessionIdFromCookie(request, SECRET, false)).toBe('session-c');
	// Auth.js decodes with 15 s of clock tolerance (its jwt decode), so step well past it.
	vi.setSystemTime(new Date('2026-12-03T06:00:30Z'));
	expect(await sessionIdFromCookie(request, SECRET, false)).toBeUndefined();
});

test('the secure cookie name is read only when the site is served over https', async () => {
	const value = await encode({
		token: { sid: 'session-d' },
		secret: SECRET,
		salt: `__Secure-${NAME}`,
		maxAge: 3600
	});
	const request = new Request('https://crew.example/', {
		headers: { cookie: `__Secure-${NAME}=${value}` }
	});
	expect(await sessionIdFromCookie(request, SECRET, true)).toBe('session-d');
	expect(await sessionIdFromCookie(request, SECRET, false)).toBeUndefined();
});
