/**
 * HTTP security headers on what the built server answers, per OWASP ASVS 4.0.3 V14.4 (HTTP
 * security headers): a Content-Security-Policy on every page (14.4.3), X-Content-Type-Options:
 * nosniff (14.4.4), a Referrer-Policy (14.4.6), framing refused with CSP frame-ancestors and
 * X-Frame-Options (14.4.7), and answers with personal data not cached (V8.2.1, Cache-Control).
 * Directive syntax: W3C Content Security Policy Level 3 (script nonces, frame-ancestors,
 * 'unsafe-inline' ignored where a nonce is present); Referrer-Policy values: W3C Referrer Policy.
 */
import { beforeAll, describe, expect, inject, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

let producer: Visitor;
beforeAll(async () => {
	producer = await signedIn(demo.producer);
});

/** The CSP header as { directive: [sources] }. */
function policy(response: Response): Record<string, string[]> {
	const header = response.headers.get('content-security-policy') ?? '';
	return Object.fromEntries(
		header
			.split(';')
			.map((part) => part.trim().split(/\s+/))
			.filter(([name]) => name)
			.map(([name, ...sources]) => [name.toLowerCase(), sources])
	);
}

function expectCommonHeaders(response: Response) {
	expect(response.headers.get('x-content-type-options')).toBe('nosniff');
	expect(response.headers.get('referrer-policy')).toBe('strict-origin-when-cross-origin');
	expect(response.headers.get('x-frame-options')).toBe('DENY');
}

describe('pages', () => {
	test("a signed-in page has a nonce-based CSP without 'unsafe-inline' for scripts, refuses framing, and is not cached", async () => {
		const response = await producer.request('/episodes', { headers: { accept: 'text/html' } });
		expect(response.status).toBe(200);
		expectCommonHeaders(response);
		const cacheControl = response.headers.get('cache-control') ?? '';
		expect(cacheControl).toContain('private');
		expect(cacheControl).toContain('no-store');

		const csp = policy(response);
		expect(csp['default-src']).toEqual(["'self'"]);
		expect(csp['frame-ancestors']).toEqual(["'none'"]);
		expect(csp['object-src']).toEqual(["'none'"]);
		expect(csp['base-uri']).toBeDefined();
		expect(csp['form-action']).toEqual(["'self'"]);
		expect(csp['script-src']).toContain("'self'");
		expect(csp['script-src']).not.toContain("'unsafe-inline'");
		expect(csp['script-src']).not.toContain("'unsafe-eval'");
		const nonces = csp['script-src'].filter((source) => source.startsWith("'nonce-"));
		expect(nonces).toHaveLength(1);

		// Every inline script on the page (the app's own before-hydration script and SvelteKit's
		// start-up script) carries that nonce, so the browser runs them and nothing else inline.
		const nonce = nonces[0].slice("'nonce-".length, -1);
		const html = await response.text();
		const inline = [...html.matchAll(/<script\b([^>]*)>/g)]
			.map((match) => match[1])
			.filter(
				(attributes) => !/\bsrc=/.test(attributes) && !/type="application\/json"/.test(attributes)
			);
		expect(inline.length).toBeGreaterThanOrEqual(2);
		for (const attributes of inline) expect(attributes).toContain(`nonce="${nonce}"`);
	});

	test('each page load gets a fresh nonce', async () => {
		const nonceOf = async () =>
			policy(await producer.request('/', { headers: { accept: 'text/html' } }))['script-src'].find(
				(source) => source.startsWith("'nonce-")
			);
		const [first, second] = [await nonceOf(), await nonceOf()];
		expect(first).toBeTruthy();
		expect(first).not.toBe(second);
	});

	test('the public sign-in page has the same policy and headers', async () => {
		const response = await new Visitor().request('/signin', { headers: { accept: 'text/html' } });
		expect(response.status).toBe(200);
		expectCommonHeaders(response);
		expect(policy(response)['frame-ancestors']).toEqual(["'none'"]);
	});
});

describe('API, tracked links, static files', () => {
	test('an API answer is nosniff, unframeable and not cached, signed in or not', async () => {
		for (const visitor of [producer, new Visitor()]) {
			const response = await visitor.request('/api/me');
			expect([200, 401]).toContain(response.status);
			expectCommonHeaders(response);
			expect(response.headers.get('cache-control')).toBe('private, no-store');
			expect(policy(response)['frame-ancestors']).toEqual(["'none'"]);
		}
	});

	test('the /go/ redirect tells the store only our origin (Referrer-Policy) and is not cached', async () => {
		const [link] = await sql(`SELECT code FROM tracked_link LIMIT 1`);
		// HEAD: the same redirect, never counted as a click.
		const response = await fetch(`${inject('baseUrl')}/go/${link.code}`, {
			method: 'HEAD',
			redirect: 'manual'
		});
		expect(response.status).toBe(302);
		expectCommonHeaders(response);
		expect(response.headers.get('cache-control')).toBe('no-store');
	});

	test('a hashed static file under /_app/immutable keeps its long-lived public cache', async () => {
		const html = await (await fetch(`${inject('baseUrl')}/signin`)).text();
		const asset = html.match(/\/_app\/immutable\/[^"']+\.js/)?.[0];
		expect(asset).toBeTruthy();
		const response = await fetch(`${inject('baseUrl')}${asset}`);
		expect(response.status).toBe(200);
		expect(response.headers.get('content-type')).toMatch(/javascript/);
		const cacheControl = response.headers.get('cache-control') ?? '';
		expect(cacheControl).toContain('immutable');
		expect(cacheControl).not.toContain('no-store');
	});
});
