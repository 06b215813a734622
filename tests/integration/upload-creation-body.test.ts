/**
 * A tus creation request that carries its first bytes (tus 1.0.0, "Creation With Upload": a POST
 * with `Content-Type: application/offset+octet-stream` and a body) is held to the same request body
 * limit as a PATCH (BODY_SIZE_LIMIT): one declaring more is refused with 413 Content Too Large
 * (RFC 9110 §15.5.14) before anything is created or stored. Raw node:http, so the test controls
 * the framing.
 */
import http from 'node:http';
import { beforeAll, expect, test } from 'vitest';
import { Visitor, baseUrl, demo, signedIn, sql } from '../helpers/http';
import { BODY_SIZE_LIMIT_BYTES } from '../../src/lib/upload-rules';

const MiB = 1024 * 1024;
let camera: Visitor;
let episodeId = '';

beforeAll(async () => {
	camera = await signedIn(demo.camera);
	const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`);
	episodeId = episode.id;
});

/** Starts a creation POST declaring `declared` body bytes and sends the first MiB of them. */
function createWithBody(fileName: string, declared: number): Promise<{ status: number }> {
	const metadata = { filename: fileName, filetype: 'video/mp4', episodeId };
	return new Promise((resolve, reject) => {
		const request = http.request(new URL('/api/uploads', baseUrl()), {
			method: 'POST',
			agent: false,
			headers: {
				cookie: camera.cookieHeader(),
				origin: baseUrl(),
				'tus-resumable': '1.0.0',
				'upload-length': String(declared),
				'upload-metadata': Object.entries(metadata)
					.map(([key, value]) => `${key} ${Buffer.from(value).toString('base64')}`)
					.join(','),
				'content-type': 'application/offset+octet-stream',
				'content-length': String(declared)
			}
		});
		let answered = false;
		request.on('response', (response) => {
			answered = true;
			response.resume();
			response.on('end', () => {
				resolve({ status: response.statusCode! });
				request.destroy();
			});
		});
		request.on('error', (failure) => {
			if (!answered) reject(failure);
		});
		// One piece and no more: a server that judges the declared length answers without waiting
		// for the rest (and a client still writing could see the refused connection close first).
		request.write(Buffer.alloc(MiB, 'a'));
	});
}

test('a creation POST whose body declares more than the body limit is refused with 413 and creates nothing', async () => {
	const answer = await createWithBody('creation-over-limit.mp4', BODY_SIZE_LIMIT_BYTES + MiB);
	expect(answer.status).toBe(413);
	const rows = await sql(`SELECT id FROM upload WHERE file_name = 'creation-over-limit.mp4'`);
	expect(rows).toHaveLength(0);
});
