/**
 * Headers every answer of the app carries (OWASP ASVS 4.0.3 V14.4). Pages get their
 * Content-Security-Policy from `kit.csp` in svelte.config.js; other answers (JSON, redirects,
 * downloads) that set none get one that allows nothing. Files under /_app and static/ are served
 * by adapter-node before any hook runs, so a deployment's proxy adds what they need (README,
 * "Production").
 */
const EVERYWHERE = {
	'x-content-type-options': 'nosniff',
	// frame-ancestors 'none' in the CSP refuses framing; this says the same to older browsers.
	'x-frame-options': 'DENY',
	// Links out (the /go/ redirect to a store included) tell the other site our origin, not the page.
	'referrer-policy': 'strict-origin-when-cross-origin'
};

/**
 * Adds the headers to an answer. `personal` answers (anything a signed-in person gets, and every
 * API answer) are not stored by the browser or any cache, unless the route chose its own policy
 * (tus HEAD's `no-store`, a clip's private cache for seeking).
 */
export function withSecurityHeaders(response: Response, personal: boolean): Response {
	// A Response made with Response.redirect() or fetch() has read-only headers: copy it first.
	let answer = response;
	try {
		answer.headers.set('x-content-type-options', EVERYWHERE['x-content-type-options']);
	} catch {
		answer = new Response(response.body, {
			status: response.status,
			statusText: response.statusText,
			headers: new Headers(response.headers)
		});
	}
	for (const [name, value] of Object.entries(EVERYWHERE)) answer.headers.set(name, value);
	if (personal && !answer.headers.has('cache-control'))
		answer.headers.set('cache-control', 'private, no-store');
	const type = answer.headers.get('content-type') ?? '';
	if (!type.startsWith('text/html') && !answer.headers.has('content-security-policy'))
		answer.headers.set('content-security-policy', "default-src 'none'; frame-ancestors 'none'");
	return answer;
}
