/**
 * Resumable footage uploads against the tus 1.0.0 protocol (https://tus.io/protocols/resumable-upload),
 * through the built server with the real tus-js-client: conformance, interruption and resume,
 * a server killed mid-upload, role and input checks, range downloads (RFC 9110 §14) and deletion.
 */
import { createHash, randomBytes } from 'node:crypto';
import {
	copyFileSync,
	createReadStream,
	mkdtempSync,
	readdirSync,
	readFileSync,
	rmSync,
	writeFileSync,
	existsSync
} from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import * as tus from 'tus-js-client';
import { Visitor, demo, signedIn, sql } from '../helpers/http';
import { startServer, stopServer } from '../helpers/global-setup';
import { freePort, waitForHttp } from '../helpers/net';

const CHUNK = 4 * 1024 * 1024;
const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-uploads-'));
const bigFile = path.join(work, 'bay3-a-cam-0001.mp4');
let bigSha = '';
let episodeId = '';
let camera: Visitor;

const b64 = (value: string) => Buffer.from(value).toString('base64');
const metadataHeader = (fields: Record<string, string>) =>
	Object.entries(fields)
		.map(([k, v]) => `${k} ${b64(v)}`)
		.join(',');
const storedFiles = () =>
	existsSync(inject('uploadDir'))
		? readdirSync(inject('uploadDir')).filter(
				(name) => !name.endsWith('.json') && name !== 'derived'
			)
		: [];

beforeAll(async () => {
	const data = randomBytes(50 * 1024 * 1024); // 50 MB of generated footage stand-in
	writeFileSync(bigFile, data);
	bigSha = createHash('sha256').update(data).digest('hex');
	camera = await signedIn(demo.camera);
	const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`);
	episodeId = episode.id;
});
afterAll(() => rmSync(work, { recursive: true, force: true }));

function upload(
	visitor: Visitor,
	file: string,
	options: Partial<tus.UploadOptions> & { endpointBase?: string } = {}
) {
	const base = options.endpointBase ?? inject('baseUrl');
	return new tus.Upload(createReadStream(file), {
		endpoint: `${base}/api/uploads`,
		chunkSize: CHUNK,
		retryDelays: [],
		headers: { cookie: visitor.cookieHeader(), origin: base },
		metadata: {
			filename: path.basename(file),
			filetype: 'video/mp4',
			episodeId,
			cameraLabel: 'A cam',
			clipName: 'A001 rear block install'
		},
		...options
	});
}

/** Starts an upload and aborts it once at least half the bytes are on the server. */
function uploadHalf(tusUpload: tus.Upload): Promise<string> {
	return new Promise((resolve, reject) => {
		const size = 50 * 1024 * 1024;
		tusUpload.options.onProgress = (sent) => {
			if (sent >= size / 2) void tusUpload.abort().then(() => resolve(tusUpload.url!));
		};
		tusUpload.options.onError = reject;
		tusUpload.options.onSuccess = () =>
			reject(new Error('finished before it could be interrupted'));
		tusUpload.start();
	});
}

function finish(tusUpload: tus.Upload): Promise<void> {
	return new Promise((resolve, reject) => {
		tusUpload.options.onError = reject;
		tusUpload.options.onSuccess = () => resolve();
		tusUpload.start();
	});
}

async function serverOffset(visitor: Visitor, url: string) {
	const response = await visitor.request(new URL(url).pathname, {
		method: 'HEAD',
		headers: { 'Tus-Resumable': '1.0.0' }
	});
	return Number(response.headers.get('upload-offset'));
}

describe('tus 1.0.0 protocol conformance', () => {
	test('OPTIONS advertises the version, extensions and maximum size', async () => {
		const response = await new Visitor().request('/api/uploads', { method: 'OPTIONS' });
		expect([200, 204]).toContain(response.status);
		expect(response.headers.get('tus-version')).toContain('1.0.0');
		const extensions = response.headers.get('tus-extension')!.split(',');
		expect(extensions).toEqual(expect.arrayContaining(['creation', 'termination']));
		expect(Number(response.headers.get('tus-max-size'))).toBe(50 * 1024 ** 3);
	});

	test('creation answers 201 with Location; HEAD gives Upload-Offset with no-store; PATCH at a wrong offset gets 409; termination 204', async () => {
		const create = await camera.request('/api/uploads', {
			method: 'POST',
			headers: {
				'Tus-Resumable': '1.0.0',
				'Upload-Length': '10',
				'Upload-Metadata': metadataHeader({
					filename: 'proto.wav',
					filetype: 'audio/wav',
					episodeId
				})
			}
		});
		expect(create.status).toBe(201);
		expect(create.headers.get('tus-resumable')).toBe('1.0.0');
		const location = create.headers.get('location')!;
		expect(location).toMatch(/^\/api\/uploads\/[0-9a-f]{32}$/);

		const head = await camera.request(location, {
			method: 'HEAD',
			headers: { 'Tus-Resumable': '1.0.0' }
		});
		expect(head.status).toBe(200);
		expect(head.headers.get('upload-offset')).toBe('0');
		expect(head.headers.get('upload-length')).toBe('10');
		expect(head.headers.get('cache-control')).toBe('no-store');

		const patchHeaders = (offset: number) => ({
			'Tus-Resumable': '1.0.0',
			'Upload-Offset': String(offset),
			'Content-Type': 'application/offset+octet-stream'
		});
		const wrong = await camera.request(location, {
			method: 'PATCH',
			headers: patchHeaders(5),
			body: Buffer.from('abcde')
		});
		expect(wrong.status).toBe(409);
		const right = await camera.request(location, {
			method: 'PATCH',
			headers: patchHeaders(0),
			body: Buffer.from('abcde')
		});
		expect(right.status).toBe(204);
		expect(right.headers.get('upload-offset')).toBe('5');

		const removed = await camera.request(location, {
			method: 'DELETE',
			headers: { 'Tus-Resumable': '1.0.0' }
		});
		expect(removed.status).toBe(204);
		expect(storedFiles()).not.toContain(location.split('/').pop());
	});
});

describe('resumable uploads with tus-js-client', () => {
	test('an upload interrupted halfway resumes from the stored offset and the stored file has the same SHA-256', async () => {
		const url = await uploadHalf(upload(camera, bigFile));
		const offset = await serverOffset(camera, url);
		expect(offset).toBeGreaterThanOrEqual(25 * 1024 * 1024 - CHUNK);
		expect(offset).toBeLessThan(50 * 1024 * 1024);

		let firstPatchOffset = -1;
		const resumed = upload(camera, bigFile, {
			uploadUrl: url,
			onBeforeRequest(request) {
				if (request.getMethod() === 'PATCH' && firstPatchOffset < 0)
					firstPatchOffset = Number(request.getHeader('Upload-Offset'));
			}
		});
		await finish(resumed);
		expect(firstPatchOffset).toBe(offset); // it did not start over

		const id = url.split('/').pop()!;
		const stored = createHash('sha256')
			.update(readFileSync(path.join(inject('uploadDir'), id)))
			.digest('hex');
		expect(stored).toBe(bigSha);
		const [row] = await sql(
			`SELECT sha256, size_bytes, clip_name, camera_label, purpose FROM footage WHERE upload_id = $1`,
			[id]
		);
		expect(row).toMatchObject({
			sha256: bigSha,
			size_bytes: String(50 * 1024 * 1024),
			clip_name: 'A001 rear block install',
			camera_label: 'A cam',
			purpose: 'footage'
		});
	});

	test('a server killed with SIGKILL mid-upload is restarted and the upload resumes to an identical file', async () => {
		const port = await freePort();
		const base = `http://127.0.0.1:${port}`;
		const env = { ...inject('serverEnv'), PORT: String(port), ORIGIN: base };
		let server = startServer(env);
		await waitForHttp(`${base}/healthz`, 30_000);
		const visitor = new Visitor();
		const signIn = await fetch(`${base}/signin`, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				origin: base,
				accept: 'text/html',
				'content-type': 'application/x-www-form-urlencoded'
			},
			body: new URLSearchParams({ email: demo.camera, password: 'wrenchroll-demo-bay3' })
		});
		for (const line of signIn.headers.getSetCookie())
			visitor.cookies.set(line.split('=')[0], line.split(';')[0].split('=').slice(1).join('='));

		const killedAt = await new Promise<string>((resolve, reject) => {
			const tusUpload = upload(visitor, bigFile, { endpointBase: base });
			tusUpload.options.onProgress = (sent) => {
				if (sent >= 20 * 1024 * 1024 && server.exitCode === null && server.signalCode === null) {
					server.kill('SIGKILL');
					resolve(tusUpload.url!);
				}
			};
			tusUpload.options.onError = () => undefined; // the connection dies with the server
			tusUpload.options.onSuccess = () => reject(new Error('finished before the kill'));
			tusUpload.start();
		});
		await new Promise((resolve) => server.once('exit', resolve));
		server = startServer(env);
		await waitForHttp(`${base}/healthz`, 30_000);
		try {
			const resumed = upload(visitor, bigFile, { endpointBase: base, uploadUrl: killedAt });
			await finish(resumed);
			const id = killedAt.split('/').pop()!;
			const [row] = await sql(`SELECT sha256 FROM footage WHERE upload_id = $1`, [id]);
			expect(row.sha256).toBe(bigSha);
		} finally {
			await stopServer(server);
		}
	});
});

describe('who may upload, and what', () => {
	const tryCreate = (visitor: Visitor, fields: Record<string, string>, length = '1000') =>
		visitor.request('/api/uploads', {
			method: 'POST',
			headers: {
				'Tus-Resumable': '1.0.0',
				'Upload-Length': length,
				'Upload-Metadata': metadataHeader(fields)
			}
		});

	test('signed out, merch, over the size limit, a disallowed type, a foreign episode: refused, nothing stored', async () => {
		const before = storedFiles().length;
		const fields = { filename: 'x.mp4', filetype: 'video/mp4', episodeId };
		expect((await tryCreate(new Visitor(), fields)).status).toBe(401);
		const merch = await signedIn(demo.merch);
		expect((await tryCreate(merch, fields)).status).toBe(403);
		expect((await tryCreate(camera, fields, String(51 * 1024 ** 3))).status).toBe(413);
		const badType = await tryCreate(camera, {
			...fields,
			filename: 'run.sh',
			filetype: 'application/x-sh'
		});
		expect(badType.status).toBe(400);
		expect(await badType.text()).toMatch(/Only video, audio and still-image files/);
		// An SVG is an image type but a document that can carry script (W3C SVG 1.1 §18 Scripting).
		for (const filetype of ['image/svg+xml', 'image/SVG+XML', 'image/foo+xml']) {
			expect(
				(await tryCreate(camera, { ...fields, filename: 'badge.svg', filetype })).status,
				filetype
			).toBe(400);
		}
		const [other] = await sql(`SELECT id FROM episode WHERE slug = 'sandpiper-brake-refresh'`);
		expect((await tryCreate(camera, { ...fields, episodeId: other.id })).status).toBe(404);
		const host = await signedIn(demo.host);
		expect((await tryCreate(host, fields)).status).toBe(403);
		expect(storedFiles().length).toBe(before);
	});

	test('path-like upload ids and someone else’s upload answer 404', async () => {
		expect(
			(
				await camera.request('/api/uploads/..%2F..%2Fetc%2Fpasswd', {
					method: 'HEAD',
					headers: { 'Tus-Resumable': '1.0.0' }
				})
			).status
		).toBe(404);
		expect(
			(
				await camera.request('/api/uploads/../../package.json', {
					method: 'PATCH',
					headers: {
						'Tus-Resumable': '1.0.0',
						'Upload-Offset': '0',
						'Content-Type': 'application/offset+octet-stream'
					},
					body: 'x'
				})
			).status
		).toBeGreaterThanOrEqual(400);
		const create = await tryCreate(camera, {
			filename: 'mine.mp4',
			filetype: 'video/mp4',
			episodeId
		});
		const location = create.headers.get('location')!;
		const editor = await signedIn(demo.editor); // another person: the upload is not theirs
		expect(
			(await editor.request(location, { method: 'HEAD', headers: { 'Tus-Resumable': '1.0.0' } }))
				.status
		).toBe(404);
	});

	test('file names are cleaned of folders and control characters', async () => {
		const create = await tryCreate(
			camera,
			{ filename: '../../etc/\u0007shop clip.mp4', filetype: 'video/mp4', episodeId },
			'0'
		);
		expect(create.status).toBe(201);
		const id = create.headers.get('location')!.split('/').pop();
		const [row] = await sql(`SELECT file_name FROM upload WHERE id = $1`, [id]);
		expect(row.file_name).toBe('shop clip.mp4');
	});

	test('the editor may upload a cut but not footage', async () => {
		const editor = await signedIn(demo.editor);
		const [channel] = await sql(`SELECT channel_id FROM episode WHERE id = $1`, [episodeId]);
		await editor.request('/channel?/switch', {
			method: 'POST',
			form: { channelId: channel.channel_id }
		});
		expect(
			(await tryCreate(editor, { filename: 'proxy.mp4', filetype: 'video/mp4', episodeId })).status
		).toBe(403);
		expect(
			(
				await tryCreate(editor, {
					filename: 'proxy.mp4',
					filetype: 'video/mp4',
					episodeId,
					purpose: 'cut'
				})
			).status
		).toBe(201);
	});
});

describe('downloads and deletion', () => {
	let footageId = '';
	beforeAll(async () => {
		const [row] = await sql(
			`SELECT id FROM footage WHERE sha256 = $1 ORDER BY created_at LIMIT 1`,
			[bigSha]
		);
		footageId = row.id;
	});

	test('range requests return the exact bytes with 206, and 416 past the end', async () => {
		const source = readFileSync(bigFile);
		const partial = await camera.request(`/api/footage/${footageId}/file`, {
			headers: { range: 'bytes=1000-1999' }
		});
		expect(partial.status).toBe(206);
		expect(partial.headers.get('content-range')).toBe(`bytes 1000-1999/${source.length}`);
		expect(Buffer.from(await partial.arrayBuffer()).equals(source.subarray(1000, 2000))).toBe(true);
		const beyond = await camera.request(`/api/footage/${footageId}/file`, {
			headers: { range: `bytes=${source.length + 10}-` }
		});
		expect(beyond.status).toBe(416);
		const other = await signedIn(demo.otherProducer);
		expect((await other.request(`/api/footage/${footageId}/file`)).status).toBe(404);
	});

	test('a clip is served with nosniff and a sandbox policy; a type that is not media goes out as a plain download', async () => {
		// RFC 9110 §8.3 Content-Type; X-Content-Type-Options (WHATWG Fetch §"X-Content-Type-Options");
		// CSP Level 3 "sandbox" directive: a file opened on its own runs no script.
		const media = await camera.request(`/api/footage/${footageId}/file`);
		expect(media.headers.get('content-type')).toBe('video/mp4');
		expect(media.headers.get('content-disposition')).toMatch(/^inline;/);
		expect(media.headers.get('x-content-type-options')).toBe('nosniff');
		expect(media.headers.get('content-security-policy')).toMatch(/^sandbox/);
		await media.arrayBuffer();
		// A row from before SVG was refused: copy the stored file under a new id and label it SVG.
		const [row] = await sql(`SELECT * FROM footage WHERE id = $1`, [footageId]);
		const copyId = `svg-${Date.now()}`;
		copyFileSync(
			path.join(inject('uploadDir'), row.upload_id),
			path.join(inject('uploadDir'), copyId)
		);
		const [svg] = await sql(
			`INSERT INTO footage (channel_id, episode_id, upload_id, purpose, camera_label, clip_name, file_name, file_type, size_bytes, sha256, uploaded_by)
			 VALUES ($1, $2, $3, 'footage', '', 'badge', 'badge.svg', 'image/svg+xml', $4, $5, $6) RETURNING id`,
			[row.channel_id, row.episode_id, copyId, row.size_bytes, row.sha256, row.uploaded_by]
		);
		const served = await camera.request(`/api/footage/${svg.id}/file`);
		expect(served.status).toBe(200);
		expect(served.headers.get('content-type')).toBe('application/octet-stream');
		expect(served.headers.get('content-disposition')).toMatch(/^attachment;/);
		await served.arrayBuffer();
		await sql(`DELETE FROM footage WHERE id = $1`, [svg.id]);
		rmSync(path.join(inject('uploadDir'), copyId), { force: true });
	});

	test('the footage list shows the clip with its hash; ffprobe fields are empty with a reason when it is missing or the file is not media', async () => {
		const list = await camera.api(`/api/episodes/${episodeId}/footage?sort=size&direction=desc`);
		expect(list.status).toBe(200);
		const clip = list.body.footage.find((f: { id: string }) => f.id === footageId);
		expect(clip.sha256).toBe(bigSha);
		expect(clip.durationSeconds).toBeNull(); // random bytes are no video
		expect(clip.probeNote).toMatch(/ffprobe/);
		// The file is on disk, so the page offers Play and Download; the upload id stays private.
		expect(clip.onDisk).toBe(true);
		expect(clip).not.toHaveProperty('uploadId');
	});

	test('a demo clip with no file behind it is listed as not on the server, and its file answers 404 in words', async () => {
		const [demoClip] = await sql(
			`SELECT f.id, f.episode_id FROM footage f WHERE f.upload_id LIKE 'demo-%' LIMIT 1`
		);
		const producer = await signedIn(demo.producer);
		const list = await producer.api(`/api/episodes/${demoClip.episode_id}/footage`);
		expect(list.body.footage.find((f: { id: string }) => f.id === demoClip.id).onDisk).toBe(false);
		const file = await producer.api(`/api/footage/${demoClip.id}/file`);
		expect(file.status).toBe(404);
		expect(file.body.error).toContain('not on the server');
		const page = await (await producer.request(`/episodes/${demoClip.episode_id}/footage`)).text();
		expect(page).toContain('No file on server');
	});

	test('only a producer deletes footage, and the file goes with the row', async () => {
		const [row] = await sql(`SELECT upload_id FROM footage WHERE id = $1`, [footageId]);
		expect((await camera.api(`/api/footage/${footageId}`, { method: 'DELETE' })).status).toBe(403);
		const producer = await signedIn(demo.producer);
		expect((await producer.api(`/api/footage/${footageId}`, { method: 'DELETE' })).status).toBe(
			204
		);
		expect(await sql(`SELECT 1 FROM footage WHERE id = $1`, [footageId])).toHaveLength(0);
		expect(storedFiles()).not.toContain(row.upload_id);
	});
});

describe('media details from ffprobe', () => {
	const ffmpeg = '/usr/bin/ffmpeg';
	test.skipIf(!existsSync(ffmpeg))(
		'a real 2-second 29.97 fps clip is recorded with its duration, frame rate and codec',
		async () => {
			const { execFileSync } = await import('node:child_process');
			const clip = path.join(work, 'bay3-b-cam-test-pattern.mp4');
			// A generated test pattern at the exact NTSC rate 30000/1001 (SMPTE ST 12-1's 29.97).
			execFileSync(ffmpeg, [
				'-v',
				'error',
				'-f',
				'lavfi',
				'-i',
				'testsrc=duration=2:size=320x240:rate=30000/1001',
				'-c:v',
				'mpeg4',
				'-y',
				clip
			]);
			const tusUpload = upload(camera, clip, {
				metadata: { filename: 'b-cam.mp4', filetype: 'video/mp4', episodeId, cameraLabel: 'B cam' }
			});
			await finish(tusUpload);
			const id = tusUpload.url!.split('/').pop();
			const [row] = await sql(
				`SELECT duration_seconds, frame_rate, video_codec, probe_note FROM footage WHERE upload_id = $1`,
				[id]
			);
			expect(row.duration_seconds).toBeCloseTo(2.0, 1);
			expect(row.frame_rate).toBe('29.97');
			expect(row.video_codec).toBe('mpeg4');
			expect(row.probe_note).toBeNull();
		}
	);
});
