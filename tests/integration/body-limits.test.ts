/**
 * Request body limits are enforced on the bytes as they arrive, not on what the headers claim:
 * JSON bodies stop at 4 MiB and tus PATCH bodies at the server's body limit (BODY_SIZE_LIMIT),
 * whether the client sends a Content-Length or `Transfer-Encoding: chunked` (RFC 9112 §7.1), and a
 * refused body changes nothing. Raw node:http, so the test controls the framing byte by byte.
 *
 * tus 1.0.0 (https://tus.io/protocols/resumable-upload, core protocol, PATCH): "All PATCH requests
 * MUST use Content-Type: application/offset+octet-stream, otherwise the server SHOULD return a 415
 * Unsupported Media Type status"; the new offset is the old one plus the bytes stored, and HEAD
 * answers the current Upload-Offset. 413 Content Too Large: RFC 9110 §15.5.14.
 */
import { createHash, randomBytes } from 'node:crypto';
import http from 'node:http';
import { beforeAll, describe, expect, test } from 'vitest';
import { Visitor, baseUrl, demo, signedIn, sql } from '../helpers/http';
import { BODY_SIZE_LIMIT_BYTES } from '../../src/lib/upload-rules';

const MiB = 1024 * 1024;
const JSON_LIMIT = 4 * MiB; // README: "JSON bodies stop at 4 MiB"

let producer: Visitor;
let camera: Visitor;
let episodeId = '';

beforeAll(async () => {
	producer = await signedIn(demo.producer);
	camera = await signedIn(demo.camera);
	const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`);
	episodeId = episode.id;
});

interface Answer {
	status: number;
	headers: http.IncomingHttpHeaders;
	body: string;
	/** body bytes written before the answer arrived */
	sent: number;
}

/**
 * Sends `total` body bytes in 1 MiB pieces (after `prefix`), chunked unless a Content-Length is
 * given, and stops sending as soon as the server answers. With `end: false` the body is never
 * finished, so an answer can only come from a server that counts bytes as they arrive. With
 * `holdMs` only the headers go out at first and the body follows after that long unless the
 * server has answered: a refusal made on the headers alone then arrives with nothing sent, and
 * the client is not still writing when the server closes the connection (which made the write
 * fail with EPIPE before the answer was read, now and then).
 */
function send(
	visitor: Visitor,
	path: string,
	options: {
		method: string;
		headers: Record<string, string>;
		total: number;
		prefix?: Buffer;
		fill?: Buffer;
		end?: boolean;
		holdMs?: number;
	}
): Promise<Answer> {
	const { method, total, end = true } = options;
	const prefix = options.prefix ?? Buffer.alloc(0);
	const fill = options.fill ?? Buffer.alloc(MiB, 'a');
	return new Promise((resolve, reject) => {
		const headers: Record<string, string> = {
			cookie: visitor.cookieHeader(),
			origin: baseUrl(),
			...options.headers
		};
		if (!('content-length' in headers)) headers['transfer-encoding'] = 'chunked';
		const request = http.request(new URL(path, baseUrl()), { method, headers, agent: false });
		let sent = 0;
		let answered = false;
		const noAnswer = setTimeout(
			() => reject(new Error(`no answer after ${sent} bytes were sent`)),
			30_000
		);
		request.on('response', (response) => {
			answered = true;
			const pieces: Buffer[] = [];
			response.on('data', (piece: Buffer) => pieces.push(piece));
			response.on('end', () => {
				clearTimeout(noAnswer);
				resolve({
					status: response.statusCode!,
					headers: response.headers,
					body: Buffer.concat(pieces).toString('utf8'),
					sent
				});
				request.destroy();
			});
		});
		request.on('error', (failure) => {
			if (!answered) {
				clearTimeout(noAnswer);
				reject(failure);
			}
		});
		let offset = 0;
		const pump = () => {
			if (sent === 0 && prefix.length) {
				sent += prefix.length;
				if (!request.write(prefix)) return void request.once('drain', pump);
			}
			while (!answered && sent < total) {
				const size = Math.min(fill.length - offset, total - sent);
				const piece = fill.subarray(offset, offset + size);
				offset = (offset + size) % fill.length;
				sent += size;
				if (!request.write(piece)) return void request.once('drain', pump);
			}
			if (!answered && end) request.end();
		};
		if (options.holdMs === undefined) return pump();
		request.flushHeaders();
		setTimeout(() => answered || pump(), options.holdMs);
	});
}

describe('JSON bodies stop at 4 MiB whatever the framing', () => {
	const jsonHeaders = { 'content-type': 'application/json', accept: 'application/json' };

	test('a small chunked JSON body is read and validated as usual (400 with field issues)', async () => {
		const body = Buffer.from(JSON.stringify({ email: 'not an address', name: '', roles: [] }));
		const answer = await send(producer, '/api/crew', {
			method: 'POST',
			headers: jsonHeaders,
			total: body.length,
			fill: body
		});
		expect(answer.status).toBe(400);
		expect(JSON.parse(answer.body).issues).toHaveProperty('email');
	});

	test('a chunked JSON body of 41 MiB is refused with 413, not parsed', async () => {
		const answer = await send(producer, '/api/crew', {
			method: 'POST',
			headers: jsonHeaders,
			prefix: Buffer.from('{"name":"'),
			total: 41 * MiB
		});
		expect(answer.status).toBe(413);
		expect(JSON.parse(answer.body).error).toMatch(/too large/i);
	});

	test('a chunked JSON body is refused with 413 once it passes 4 MiB, before the client has finished sending', async () => {
		// The body is never ended: only a server that counts the bytes as they stream can answer.
		const answer = await send(producer, '/api/crew', {
			method: 'POST',
			headers: jsonHeaders,
			prefix: Buffer.from('{"name":"'),
			total: JSON_LIMIT + 2 * MiB,
			end: false
		});
		expect(answer.status).toBe(413);
		expect(JSON.parse(answer.body).error).toMatch(/4 MB/);
	});

	test('a declared Content-Length over 4 MiB is refused with 413 before the body is read', async () => {
		const answer = await send(producer, '/api/crew', {
			method: 'POST',
			headers: { ...jsonHeaders, 'content-length': String(5 * MiB) },
			total: 5 * MiB,
			end: false,
			holdMs: 5_000
		});
		expect(answer.status).toBe(413);
		expect(answer.sent).toBe(0);
	});
});

describe('tus PATCH bodies (tus 1.0.0 core protocol)', () => {
	const uploadLength = 48 * MiB;
	const data = randomBytes(uploadLength);
	let location = '';

	const tusHeaders = (offset: number, contentType = 'application/offset+octet-stream') => ({
		'tus-resumable': '1.0.0',
		'upload-offset': String(offset),
		'content-type': contentType
	});
	const offsetNow = async () => {
		const head = await camera.request(location, {
			method: 'HEAD',
			headers: { 'Tus-Resumable': '1.0.0' }
		});
		expect(head.status).toBe(200);
		return Number(head.headers.get('upload-offset'));
	};

	beforeAll(async () => {
		const metadata = { filename: 'limits.mp4', filetype: 'video/mp4', episodeId };
		const create = await camera.request('/api/uploads', {
			method: 'POST',
			headers: {
				'Tus-Resumable': '1.0.0',
				'Upload-Length': String(uploadLength),
				'Upload-Metadata': Object.entries(metadata)
					.map(([key, value]) => `${key} ${Buffer.from(value).toString('base64')}`)
					.join(',')
			}
		});
		expect(create.status).toBe(201);
		location = create.headers.get('location')!;
		const first = await send(camera, location, {
			method: 'PATCH',
			headers: { ...tusHeaders(0), 'content-length': String(MiB) },
			total: MiB,
			fill: data.subarray(0, MiB)
		});
		expect(first.status).toBe(204);
		expect(first.headers['upload-offset']).toBe(String(MiB));
	});

	test('a PATCH with another Content-Type is refused with 415 and the offset is unchanged', async () => {
		for (const contentType of ['application/json', 'application/octet-stream']) {
			const answer = await send(camera, location, {
				method: 'PATCH',
				headers: { ...tusHeaders(MiB, contentType), 'content-length': '5' },
				total: 5,
				fill: Buffer.from('abcde')
			});
			expect(answer.status, contentType).toBe(415);
			expect(answer.headers['tus-resumable']).toBe('1.0.0');
			expect(answer.body).toMatch(/application\/offset\+octet-stream/);
		}
		expect(await offsetNow()).toBe(MiB);
	});

	test('a PATCH declaring more than the body limit is refused with 413 and the offset is unchanged', async () => {
		const answer = await send(camera, location, {
			method: 'PATCH',
			headers: { ...tusHeaders(MiB), 'content-length': String(BODY_SIZE_LIMIT_BYTES + MiB) },
			total: BODY_SIZE_LIMIT_BYTES + MiB,
			end: false,
			holdMs: 5_000
		});
		expect(answer.status).toBe(413);
		expect(answer.sent).toBe(0);
		expect(answer.headers['tus-resumable']).toBe('1.0.0');
		expect(await offsetNow()).toBe(MiB);
	});

	test('a chunked PATCH past the body limit is refused with 413 and stores nothing', async () => {
		const answer = await send(camera, location, {
			method: 'PATCH',
			headers: tusHeaders(MiB),
			total: BODY_SIZE_LIMIT_BYTES + MiB
		});
		expect(answer.status).toBe(413);
		expect(answer.headers['tus-resumable']).toBe('1.0.0');
		expect(await offsetNow()).toBe(MiB);
	});

	test('a chunked PATCH within the limit is stored, and the finished file has the SHA-256 of the bytes sent', async () => {
		const chunked = await send(camera, location, {
			method: 'PATCH',
			headers: tusHeaders(MiB),
			total: 3 * MiB,
			fill: data.subarray(MiB, 4 * MiB)
		});
		expect(chunked.status).toBe(204);
		expect(chunked.headers['upload-offset']).toBe(String(4 * MiB));
		expect(await offsetNow()).toBe(4 * MiB);
		// The rest in two PATCHes below the limit, as tus-js-client would send them.
		for (const [from, to] of [
			[4 * MiB, 36 * MiB],
			[36 * MiB, uploadLength]
		]) {
			const answer = await send(camera, location, {
				method: 'PATCH',
				headers: { ...tusHeaders(from), 'content-length': String(to - from) },
				total: to - from,
				fill: data.subarray(from, to)
			});
			expect(answer.status).toBe(204);
		}
		const [row] = await sql(`SELECT sha256 FROM footage WHERE upload_id = $1`, [
			location.split('/').pop()
		]);
		expect(row.sha256).toBe(createHash('sha256').update(data).digest('hex'));
	});
});
