/**
 * Redirect targets taken from a request must stay on this site (OWASP Unvalidated Redirects and
 * Forwards; OWASP ASVS 4.0.3 V5.1.5). The reference for what a browser does with a Location
 * header is the WHATWG URL Standard (https://url.spec.whatwg.org/), which Node's `URL` implements:
 * every check below resolves the helper's answer with `new URL(answer, origin)`, as a browser
 * would, and expects the same origin back.
 */
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { REDIRECT_TARGET_MAX, safeRedirectPath } from '$lib/safe-redirect';

const origin = 'https://crew.wrenchroll.test';
// A page deep inside the site as well: a relative answer would resolve against it.
const bases = [origin + '/', origin + '/episodes/5/edit?tab=chapters'];

/** The helper's answer as a browser on our site would follow it. */
function followed(target: unknown): URL[] {
	const answer = safeRedirectPath(target);
	return bases.map((base) => new URL(answer, base));
}

function expectOnSite(target: unknown) {
	const answer = safeRedirectPath(target);
	expect(answer.startsWith('/'), JSON.stringify(target)).toBe(true);
	expect(answer.startsWith('//'), JSON.stringify(target)).toBe(false);
	for (const url of followed(target)) expect(url.origin, JSON.stringify(target)).toBe(origin);
}

describe('safeRedirectPath', () => {
	// Each of these names another host (or a script) when a browser resolves it against our origin,
	// either as written or after the URL parser's normalisation (WHATWG URL: "\" is "/" for special
	// schemes; tab and newline are removed anywhere; "." and ".." segments, also as "%2e", are
	// removed from the path, which can leave "//host" at its start).
	const hostile = [
		'//evil.example/login',
		'///evil.example/login',
		'////evil.example',
		'/..//evil.example/login',
		'/%2e%2e//evil.example/login',
		'/%2E%2E//evil.example/login',
		'/.%2e//evil.example',
		'/%2e.//evil.example',
		'/a/../..//evil.example/login',
		'/a/b/../../..//evil.example',
		'/./..//evil.example',
		'/\\evil.example/x',
		'\\\\evil.example',
		'/\\/evil.example',
		'\\/evil.example',
		'/\t/evil.example',
		'/\n/evil.example',
		'/\r\n/evil.example',
		'\t//evil.example',
		' //evil.example',
		'//evil.example\t',
		'/\u0000/evil.example',
		'/../\t/evil.example',
		'javascript:alert(1)',
		'JaVaScRiPt:alert(document.cookie)',
		'data:text/html,<script>alert(1)</script>',
		'https://evil.example/',
		'http:evil.example',
		'https:/evil.example',
		'http://crew.wrenchroll.test@evil.example/',
		'//crew.wrenchroll.test@evil.example',
		'%2F%2Fevil.example',
		'／／evil.example',
		'..//evil.example',
		'/..'.repeat(500) + '//evil.example',
		'/' + 'a'.repeat(REDIRECT_TARGET_MAX),
		'/' + 'a/'.repeat(20_000)
	];

	test('every hostile form resolves, as a browser reads it, to a page of our own origin', () => {
		for (const target of hostile) expectOnSite(target);
	});

	test('the forms that reach another host, as written or once normalised, fall back to the home page', () => {
		for (const target of [
			'//evil.example/login',
			'/..//evil.example/login',
			'/%2e%2e//evil.example/login',
			'/a/../..//evil.example/login',
			'/\\evil.example/x',
			'/\t/evil.example',
			'javascript:alert(1)',
			'https://evil.example/'
		]) {
			// The reference parser agrees that the target leaves the site, either at once or when its
			// normalised path is handed on as a Location (what the old sign-in page did).
			const raw = new URL(target, origin);
			const normalised = new URL(raw.pathname + raw.search, origin);
			expect(raw.origin !== origin || normalised.origin !== origin, target).toBe(true);
			// The helper sends the visitor home instead.
			expect(safeRedirectPath(target), target).toBe('/');
		}
	});

	test('a target longer than any page address falls back instead of being trimmed', () => {
		expect(safeRedirectPath('/' + 'a'.repeat(REDIRECT_TARGET_MAX))).toBe('/');
		expect(safeRedirectPath('/' + 'a'.repeat(REDIRECT_TARGET_MAX - 1))).toHaveLength(
			REDIRECT_TARGET_MAX
		);
	});

	test('encoded slashes and backslashes inside a path stay an ordinary path on our site', () => {
		// WHATWG URL keeps "%2F" and "%5C" in a path as they are: they never become separators.
		expect(safeRedirectPath('/%2F%2Fevil.example')).toBe('/%2F%2Fevil.example');
		expect(safeRedirectPath('/%5Cevil.example')).toBe('/%5Cevil.example');
		expectOnSite('/%2F%2Fevil.example');
		expectOnSite('/%5Cevil.example');
	});

	test('a path of our own keeps its query and fragment, normalised as a browser would', () => {
		expect(safeRedirectPath('/parts?q=coil')).toBe('/parts?q=coil');
		expect(safeRedirectPath('/episodes/9/edit#chapters')).toBe('/episodes/9/edit#chapters');
		expect(safeRedirectPath('/episodes/9/../12')).toBe('/episodes/12');
		expect(safeRedirectPath('/parts?q=ölfilter')).toBe('/parts?q=%C3%B6lfilter');
		expect(safeRedirectPath('/')).toBe('/');
	});

	test('nothing usable gives the fallback', () => {
		for (const target of [undefined, null, '', 42, {}, ['/parts'], 'parts', '?q=1', '#top'])
			expect(safeRedirectPath(target, '/episodes'), String(target)).toBe('/episodes');
	});

	test('any mix of slashes, dots, encodings, controls and hosts stays on our origin (fast-check)', () => {
		// Slashes and dot segments are listed more than once so that they meet often.
		const pieces = [
			'/',
			'/',
			'/',
			'\\',
			'..',
			'%2e%2e',
			'.',
			'..',
			'%2e',
			'%2E',
			'%2f',
			'%5c',
			'\t',
			'\n',
			'\r',
			' ',
			':',
			'@',
			'?',
			'#',
			'a',
			'evil.example',
			'javascript:',
			'https:',
			'%00',
			'\u0000'
		];
		fc.assert(
			fc.property(
				fc
					.tuple(
						fc.constantFrom('/', '', '\\', ' '),
						fc.array(fc.constantFrom(...pieces), { maxLength: 14 })
					)
					.map(([start, parts]) => start + parts.join('')),
				(target) => {
					const answer = safeRedirectPath(target);
					if (!answer.startsWith('/') || answer.startsWith('//')) return false;
					return bases.every((base) => new URL(answer, base).origin === origin);
				}
			),
			{ numRuns: 5000 }
		);
	});
});
