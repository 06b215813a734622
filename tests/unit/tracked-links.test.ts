/**
 * Building a tracked link's target: the store URL with utm_source, utm_medium, utm_campaign and
 * utm_content, made with the WHATWG URL API.
 *
 * Outside sources for the checks:
 * - The results are read back with `url-parse` (npm, unshiftio; its own parser, not the WHATWG
 *   one) and its query parser `querystringify`, so the check doesn't trust the code's own parser.
 * - WHATWG URL Standard: application/x-www-form-urlencoded serialising (space as "+", "&", "=",
 *   "#" and "+" percent-encoded) and the fragment staying last.
 * - Campaign parameter names: common practice of web analytics tools (from memory).
 */
import { createRequire } from 'node:module';
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import {
	campaignSlug,
	dayWindow,
	isLinkCode,
	newLinkCode,
	trackedUrl
} from '$lib/server/merch/tracked-links';

const require = createRequire(import.meta.url);
// url-parse: new Url(address, true) parses the query into an object with querystringify.
const Url = require('url-parse') as new (
	address: string,
	parseQuery: true
) => {
	protocol: string;
	host: string;
	pathname: string;
	query: Record<string, string>;
	hash: string;
};

const tags = {
	source: 'torquehaven-garage',
	campaign: 'tallboy-coil-spacers',
	content: 'KBS-CS-150'
};

describe('trackedUrl', () => {
	test('a plain store URL gains the four campaign parameters', () => {
		const built = trackedUrl('https://shop.torquehaven.test/p/kbs-cs-150', tags);
		expect(built).toBe(
			'https://shop.torquehaven.test/p/kbs-cs-150?utm_source=torquehaven-garage&utm_medium=video&utm_campaign=tallboy-coil-spacers&utm_content=KBS-CS-150'
		);
		const parsed = new Url(built, true);
		expect(parsed.query).toEqual({
			utm_source: 'torquehaven-garage',
			utm_medium: 'video',
			utm_campaign: 'tallboy-coil-spacers',
			utm_content: 'KBS-CS-150'
		});
	});

	test('the store’s own query string is kept byte for byte, and its fragment stays last', () => {
		const store =
			'https://shop.torquehaven.test/p/kit?size=33x12.50R15&note=a%20b&flag&ref=catalogue#fitment';
		const built = trackedUrl(store, tags);
		expect(
			built.startsWith(
				'https://shop.torquehaven.test/p/kit?size=33x12.50R15&note=a%20b&flag&ref=catalogue&utm_source='
			)
		).toBe(true);
		const parsed = new Url(built, true);
		expect(parsed.hash).toBe('#fitment');
		expect(parsed.query).toMatchObject({
			size: '33x12.50R15',
			note: 'a b',
			ref: 'catalogue',
			utm_content: 'KBS-CS-150',
			utm_medium: 'video'
		});
	});

	test('an earlier campaign parameter of the same name is replaced, not repeated', () => {
		const built = trackedUrl(
			'https://shop.test/p/x?utm_source=newsletter&colour=black&utm_medium=email',
			tags
		);
		const query = new URL(built).searchParams;
		expect(query.getAll('utm_source')).toEqual(['torquehaven-garage']);
		expect(query.getAll('utm_medium')).toEqual(['video']);
		expect(query.get('colour')).toBe('black');
		expect(new Url(built, true).query).toMatchObject({
			colour: 'black',
			utm_source: 'torquehaven-garage',
			utm_medium: 'video'
		});
	});

	test('a part number with spaces, “&”, “+” and “#” is encoded so it reads back whole', () => {
		const content = 'CT MT 33x12.50 & R15+ #2';
		const built = trackedUrl('https://shop.test/p/x#top', { ...tags, content });
		// WHATWG form-urlencoded: space → "+", & → %26, + → %2B, # → %23.
		expect(built).toContain('utm_content=CT+MT+33x12.50+%26+R15%2B+%232#top');
		expect(new Url(built, true).query.utm_content).toBe(content);
	});

	test('http addresses and ports are kept', () => {
		const parsed = new Url(trackedUrl('http://127.0.0.1:8080/shop/p', tags), true);
		expect([parsed.protocol, parsed.host, parsed.pathname]).toEqual([
			'http:',
			'127.0.0.1:8080',
			'/shop/p'
		]);
	});

	test('for any store URL: its path, query and fragment survive, and the four parameters read back (property)', () => {
		const word = fc.stringMatching(/^[a-z0-9]{1,8}$/);
		fc.assert(
			fc.property(
				fc.array(word, { minLength: 1, maxLength: 3 }),
				fc.array(fc.tuple(word, word), { maxLength: 4 }),
				fc.option(word, { nil: undefined }),
				fc.string({ minLength: 1, maxLength: 20 }),
				(segments, pairs, fragment, content) => {
					const query = pairs.map(([key, value]) => `x${key}=${value}`).join('&');
					const store = `https://shop.test/${segments.join('/')}${query ? `?${query}` : ''}${fragment ? `#${fragment}` : ''}`;
					const built = trackedUrl(store, { ...tags, content });
					const parsed = new Url(built, true);
					expect(parsed.pathname).toBe(`/${segments.join('/')}`);
					expect(parsed.hash).toBe(fragment ? `#${fragment}` : '');
					if (query) expect(built).toContain(`?${query}&utm_source=`);
					expect(parsed.query.utm_campaign).toBe(tags.campaign);
					expect(new URL(built).searchParams.get('utm_content')).toBe(content);
				}
			),
			{ numRuns: 500 }
		);
	});
});

describe('codes, slugs and days', () => {
	test('codes are 8 characters of the link alphabet, with no 0/O or 1/l/I to misread', () => {
		const codes = Array.from({ length: 2000 }, newLinkCode);
		for (const code of codes) {
			expect(code).toMatch(/^[A-HJ-NP-Za-km-z2-9]{8}$/);
			expect(isLinkCode(code)).toBe(true);
		}
		// 57^8 ≈ 1.1 × 10^14 codes: 2,000 draws repeating one would be a broken generator.
		expect(new Set(codes).size).toBe(codes.length);
		expect(isLinkCode('../../x')).toBe(false);
	});

	test('the channel slug for utm_source: lower case, hyphens, accents dropped', () => {
		expect(campaignSlug('Torquehaven Garage')).toBe('torquehaven-garage');
		expect(campaignSlug('  Dune Wagon Weekly!  ')).toBe('dune-wagon-weekly');
		expect(campaignSlug('Café Élan 4×4')).toBe('cafe-elan-4-4');
	});

	test('the clicks window: consecutive UTC days ending today', () => {
		const days = dayWindow(30, new Date('2026-03-01T23:30:00Z'));
		expect(days).toHaveLength(30);
		expect(days.at(-1)).toBe('2026-03-01');
		// 2026 is not a leap year: 28 days in February, so 30 days back from 1 March starts on 31 January.
		expect(days[0]).toBe('2026-01-31');
		expect(days).toContain('2026-02-28');
	});
});
