/**
 * HTML and JSON answers are compressed when the client says it accepts that, and only then.
 * RFC 9110 §12.5.3 (Accept-Encoding): the client lists the codings it takes and `q=0` refuses one;
 * without the field the client states no preference, and sending no coding then is the usual
 * choice (common practice); §8.4 (Content-Encoding): a compressed
 * answer names its coding, and the content is the same once decoded. Decoding is done with
 * Node.js's own node:zlib (gzip, RFC 1952; brotli, RFC 7932) as the reference (tests/REFERENCES.md,
 * "HTTP"). Raw node:http, because fetch would decode on its own and hide the coding.
 */
import http from 'node:http';
import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import { beforeAll, describe, expect, test } from 'vitest';
import { Visitor, baseUrl, demo, signedIn, sql } from '../helpers/http';

interface RawAnswer {
	status: number;
	headers: http.IncomingHttpHeaders;
	/** The bytes as they crossed the wire, not decoded. */
	body: Buffer;
}

function rawRequest(
	path: string,
	headers: Record<string, string>,
	method = 'GET'
): Promise<RawAnswer> {
	return new Promise((resolve, reject) => {
		const request = http.request(new URL(path, baseUrl()), { method, headers, agent: false });
		request.on('response', (response) => {
			const pieces: Buffer[] = [];
			response.on('data', (piece: Buffer) => pieces.push(piece));
			response.on('end', () =>
				resolve({
					status: response.statusCode!,
					headers: response.headers,
					body: Buffer.concat(pieces)
				})
			);
			response.on('error', reject);
		});
		request.on('error', reject);
		request.end();
	});
}

/** Decodes a body by its Content-Encoding with node:zlib (the reference decoder). */
function decoded(answer: RawAnswer): Buffer {
	const coding = answer.headers['content-encoding'];
	if (coding === 'br') return brotliDecompressSync(answer.body);
	if (coding === 'gzip') return gunzipSync(answer.body);
	if (coding === undefined) return answer.body;
	throw new Error(`unexpected Content-Encoding ${coding}`);
}

/** A page's bytes with its per-request script nonce replaced, so two loads of one page compare. */
function withoutNonce(answer: RawAnswer, body: Buffer): string {
	const nonce = /'nonce-([^']+)'/.exec(String(answer.headers['content-security-policy']))?.[1];
	expect(nonce).toBeTruthy();
	return body.toString('utf8').replaceAll(nonce!, 'NONCE');
}

let producer: Visitor;
let episodeId = '';
beforeAll(async () => {
	producer = await signedIn(demo.producer);
	const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`);
	episodeId = episode.id;
});

const page = (encoding?: string) =>
	rawRequest('/signin', {
		accept: 'text/html',
		...(encoding === undefined ? {} : { 'accept-encoding': encoding })
	});
const api = (path: string, headers: Record<string, string> = {}) =>
	rawRequest(path, { accept: 'application/json', cookie: producer.cookieHeader(), ...headers });

describe('HTML and JSON are compressed for a client that accepts it (RFC 9110 §8.4, §12.5.3)', () => {
	test('a page asked for with gzip comes gzipped and decodes to the bytes of an uncompressed load', async () => {
		const plain = await page();
		expect(plain.status).toBe(200);
		expect(plain.headers['content-encoding']).toBeUndefined();

		const gzipped = await page('gzip');
		expect(gzipped.status).toBe(200);
		expect(gzipped.headers['content-encoding']).toBe('gzip');
		// §12.5.5: the answer depends on Accept-Encoding, so caches must key on it.
		expect(String(gzipped.headers.vary).toLowerCase()).toContain('accept-encoding');
		expect(gzipped.body.length).toBeLessThan(plain.body.length);
		expect(withoutNonce(gzipped, decoded(gzipped))).toBe(withoutNonce(plain, plain.body));
	});

	test('a page asked for with brotli comes as brotli and decodes to the same bytes', async () => {
		const plain = await page();
		const brotli = await page('br');
		expect(brotli.headers['content-encoding']).toBe('br');
		expect(withoutNonce(brotli, decoded(brotli))).toBe(withoutNonce(plain, plain.body));
	});

	test('JSON of the API comes compressed, in a coding the client listed, and decodes to the same bytes', async () => {
		const path = `/api/episodes/${episodeId}`;
		const plain = await api(path);
		expect(plain.status).toBe(200);
		expect(plain.headers['content-type']).toMatch(/^application\/json/);
		expect(plain.headers['content-encoding']).toBeUndefined();
		expect(plain.body.length).toBeGreaterThan(1024);

		for (const [accepted, codings] of [
			['gzip, deflate, br', ['br', 'gzip']],
			['gzip', ['gzip']],
			['br;q=1, gzip;q=0.5', ['br']]
		] as const) {
			const compressed = await api(path, { 'accept-encoding': accepted });
			expect(compressed.status).toBe(200);
			expect(codings as readonly string[], accepted).toContain(
				compressed.headers['content-encoding']
			);
			expect(decoded(compressed).equals(plain.body), accepted).toBe(true);
		}
	});
});

describe('nothing is compressed for a client that does not accept it, nor where it must not be', () => {
	test('no Accept-Encoding, identity only, or every coding refused with q=0: sent as is', async () => {
		for (const encoding of [undefined, 'identity', 'gzip;q=0, br;q=0, deflate;q=0']) {
			const answer = await page(encoding);
			expect(answer.status, String(encoding)).toBe(200);
			expect(answer.headers['content-encoding'], String(encoding)).toBeUndefined();
			expect(answer.body.toString('utf8')).toContain('<html');
		}
		const json = await api(`/api/episodes/${episodeId}`, { 'accept-encoding': 'identity' });
		expect(json.headers['content-encoding']).toBeUndefined();
		expect(() => JSON.parse(json.body.toString('utf8'))).not.toThrow();
	});

	test('an answer to a Range request is never compressed (its byte positions must stay true)', async () => {
		const answer = await api(`/api/episodes/${episodeId}`, {
			'accept-encoding': 'gzip, br',
			range: 'bytes=0-99'
		});
		expect(answer.headers['content-encoding']).toBeUndefined();
	});

	test('tus answers (creation, HEAD, PATCH) are never compressed and carry the security headers', async () => {
		const camera = await signedIn(demo.camera);
		const tus = (path: string, method: string, headers: Record<string, string> = {}) =>
			new Promise<RawAnswer>((resolve, reject) => {
				const request = http.request(new URL(path, baseUrl()), {
					method,
					agent: false,
					headers: {
						'tus-resumable': '1.0.0',
						'accept-encoding': 'gzip, br',
						cookie: camera.cookieHeader(),
						origin: baseUrl(),
						...headers
					}
				});
				request.on('response', (response) => {
					const pieces: Buffer[] = [];
					response.on('data', (piece: Buffer) => pieces.push(piece));
					response.on('end', () =>
						resolve({
							status: response.statusCode!,
							headers: response.headers,
							body: Buffer.concat(pieces)
						})
					);
				});
				request.on('error', reject);
				request.end(headers['content-type'] ? Buffer.alloc(2048, 'x') : undefined);
			});
		const metadata = { filename: 'coding.mp4', filetype: 'video/mp4', episodeId };
		const created = await tus('/api/uploads', 'POST', {
			'upload-length': '4096',
			'upload-metadata': Object.entries(metadata)
				.map(([key, value]) => `${key} ${Buffer.from(value).toString('base64')}`)
				.join(',')
		});
		expect(created.status).toBe(201);
		const location = String(created.headers.location);
		const head = await tus(location, 'HEAD');
		expect(head.status).toBe(200);
		const patch = await tus(location, 'PATCH', {
			'upload-offset': '0',
			'content-type': 'application/offset+octet-stream',
			'content-length': '2048'
		});
		expect(patch.status).toBe(204);
		expect(patch.headers['upload-offset']).toBe('2048');
		const refused = await tus(location, 'PATCH', {
			'upload-offset': '0',
			'content-type': 'application/json',
			'content-length': '2048'
		});
		expect(refused.status).toBe(415);
		for (const answer of [created, head, patch, refused]) {
			expect(answer.headers['content-encoding']).toBeUndefined();
			// OWASP ASVS 4.0.3 V14.4 (tests/REFERENCES.md, "Web security"), as on every other answer.
			expect(answer.headers['x-content-type-options']).toBe('nosniff');
			expect(answer.headers['x-frame-options']).toBe('DENY');
			expect(answer.headers['referrer-policy']).toBe('strict-origin-when-cross-origin');
			expect(answer.headers['content-security-policy']).toContain("default-src 'none'");
			expect(answer.headers['cache-control']).toContain('no-store');
		}
	});
});
