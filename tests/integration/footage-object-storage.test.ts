/**
 * Footage on object storage through the S3 API: a second built server with the S3 settings, against
 * s3rver (an S3-compatible server from npm) running in this test on a loopback port. A camera
 * operator uploads a small generated clip over tus; the clip and its proxy, poster, sprite and peaks
 * end up in the bucket and nothing is left in the server's upload folder; downloads and playback
 * answer 302 to a presigned address, and only to the clip's own channel.
 *
 * Checked against outside references, not our own code (tests/REFERENCES.md, "Object storage"):
 * - SHA-256 of the object in the bucket and of the original bytes, computed by Node's crypto
 *   (FIPS 180-4), and equal to what the server recorded.
 * - RFC 9110 §14 (Range requests): the presigned address, asked for one byte range, answers 206
 *   with `Content-Range: bytes first-last/complete-length` and exactly those bytes.
 * - RFC 9110 §15.4.3: 302 Found with the target in `Location`.
 * - ffprobe (Debian's ffmpeg) reads the proxy fetched from the bucket back as H.264.
 * - The AWS SDK for JavaScript v3 (a general-purpose S3 client) reads the bucket independently.
 */
import { createHash } from 'node:crypto';
import { spawn, type ChildProcess } from 'node:child_process';
import {
	existsSync,
	mkdirSync,
	mkdtempSync,
	readFileSync,
	readdirSync,
	rmSync,
	writeFileSync
} from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pg from 'pg';
import S3rver from 's3rver';
import { GetObjectCommand, HeadObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { DEMO_PASSWORD, Visitor, demo } from '../helpers/http';
import { openBrowser } from '../helpers/browser';
import { startServer, stopServer } from '../helpers/global-setup';
import { serverProcessArgs } from '../../scripts/lib/server-entry';
import { freePort, waitForHttp } from '../helpers/net';
import { dropScratchDatabase, scratchDatabase } from '../helpers/scratch-database';
import { FFMPEG, makeClip, probe, uploadClip, waitForOutputs } from '../helpers/media';

// The SDK's documented switch for its notice that later versions need Node.js 22 (README,
// "Object storage"): set before this file makes its own client, and for the server below.
process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED = 'true';

const DATABASE = 'wrenchroll_object_storage';
const BUCKET = 'bay-footage';
const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-s3-'));
const uploads = path.join(work, 'uploads');
let store: S3rver | null = null;
let server: ChildProcess | null = null;
let db: pg.Client;
let s3: S3Client;
let endpoint = '';
let base = '';
let databaseUrl = '';

const query = async (text: string, params: unknown[]) => (await db.query(text, params)).rows;
const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

async function objectBytes(key: string): Promise<Buffer> {
	const object = await s3.send(new GetObjectCommand({ Bucket: BUCKET, Key: key }));
	return Buffer.from(await object.Body!.transformToByteArray());
}

async function objectThere(key: string): Promise<boolean> {
	try {
		await s3.send(new HeadObjectCommand({ Bucket: BUCKET, Key: key }));
		return true;
	} catch (failure) {
		if ((failure as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404)
			return false;
		throw failure;
	}
}

/** Every regular file under a folder, as paths relative to it. */
function filesUnder(folder: string): string[] {
	if (!existsSync(folder)) return [];
	return readdirSync(folder, { recursive: true, withFileTypes: true })
		.filter((entry) => entry.isFile())
		.map((entry) => path.relative(folder, path.join(entry.parentPath, entry.name)));
}

beforeAll(async () => {
	mkdirSync(uploads, { recursive: true });
	const s3Port = await freePort();
	store = new S3rver({
		address: '127.0.0.1',
		port: s3Port,
		silent: true,
		directory: path.join(work, 's3rver'),
		configureBuckets: [{ name: BUCKET }]
	});
	await store.run();
	endpoint = `http://127.0.0.1:${s3Port}`;
	const credentials = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' }; // s3rver's own test key
	s3 = new S3Client({ endpoint, region: 'us-east-1', forcePathStyle: true, credentials });

	databaseUrl = await scratchDatabase(DATABASE, ['scripts/migrate.ts', 'scripts/seed.ts']);
	db = new pg.Client({ connectionString: databaseUrl });
	await db.connect();
	const port = await freePort();
	base = `http://127.0.0.1:${port}`;
	server = startServer({
		...inject('serverEnv'),
		PORT: String(port),
		ORIGIN: base,
		DATABASE_URL: databaseUrl,
		UPLOAD_DIR: uploads,
		WRENCHROLL_MEDIA_WORKER: 'inline',
		S3_ENDPOINT: endpoint,
		S3_BUCKET: BUCKET,
		S3_REGION: 'us-east-1',
		S3_ACCESS_KEY_ID: credentials.accessKeyId,
		S3_SECRET_ACCESS_KEY: credentials.secretAccessKey,
		S3_FORCE_PATH_STYLE: 'true',
		AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true'
	});
	await waitForHttp(`${base}/healthz`, 30_000);
}, 120_000);

afterAll(async () => {
	if (server) await stopServer(server);
	await db?.end();
	await dropScratchDatabase(DATABASE);
	s3?.destroy();
	await store?.close();
	rmSync(work, { recursive: true, force: true });
});

describe.skipIf(!existsSync(FFMPEG))('footage in a bucket', () => {
	let footageId = '';
	let uploadId = '';
	let original: Buffer;

	test('a finished upload and everything made from it live in the bucket, none on the server', async () => {
		const camera = new Visitor(undefined, base);
		expect((await camera.signIn(demo.camera)).status).toBe(303);
		const [episode] = await query(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`, []);
		const clip = makeClip(path.join(work, 'BCAM_0412.mp4'), {
			seconds: 3,
			size: '320x240',
			rate: '25',
			video: ['-c:v', 'libx264', '-preset', 'ultrafast'],
			audio: ['-c:a', 'aac']
		});
		original = readFileSync(clip);
		const answered = await uploadClip(camera, base, clip, {
			episodeId: episode.id,
			cameraLabel: 'B cam',
			clipName: 'BCAM_0412'
		});
		const [row] = await query(
			`SELECT id, upload_id, sha256, size_bytes, stored_in FROM footage WHERE upload_id = $1 OR id::text = $1`,
			[answered]
		);
		footageId = row.id;
		uploadId = row.upload_id;
		expect(row.stored_in).toBe('bucket');
		expect(Number(row.size_bytes)).toBe(original.length);

		// The clip in the bucket is byte for byte what was uploaded (SHA-256, Node's crypto).
		const inBucket = await objectBytes(uploadId);
		expect(sha256(inBucket)).toBe(sha256(original));
		expect(row.sha256).toBe(sha256(original));

		const outputs = await waitForOutputs(footageId, query, 120_000);
		for (const kind of ['proxy', 'poster', 'sprite', 'peaks']) {
			expect(outputs[kind].state, `${kind}: ${outputs[kind].message}`).toBe('done');
			const bytes = await objectBytes(outputs[kind].storage_key);
			expect(bytes.length, kind).toBe(Number(outputs[kind].bytes));
		}
		const proxyFile = path.join(work, 'proxy-from-bucket.mp4');
		writeFileSync(proxyFile, await objectBytes(outputs.proxy.storage_key));
		const video = probe(proxyFile).streams.find((stream) => stream.codec_type === 'video')!;
		expect(video.codec_name).toBe('h264');
		const peaks = JSON.parse((await objectBytes(outputs.peaks.storage_key)).toString('utf8'));
		expect(peaks.peaks.length).toBeGreaterThan(0);

		// Nothing of the clip stays in the server's upload folder: no file, no sidecar, no derived file.
		expect(filesUnder(uploads)).toEqual([]);
	}, 240_000);

	test('download and playback answer 302 to a presigned address that honours Range', async () => {
		expect(footageId, 'the upload test ran first').not.toBe('');
		const camera = new Visitor(undefined, base);
		await camera.signIn(demo.camera);

		const download = await camera.request(`/api/footage/${footageId}/file?download`);
		expect(download.status).toBe(302); // RFC 9110 §15.4.3
		expect(download.headers.get('cache-control')).toContain('no-store');
		const signed = download.headers.get('location')!;
		expect(signed.startsWith(`${endpoint}/${BUCKET}/${uploadId}?`)).toBe(true);
		expect(new URL(signed).searchParams.get('X-Amz-Signature')).toMatch(/^[0-9a-f]{64}$/);

		// RFC 9110 §14.2 and §15.3.7: one range, 206, Content-Range first-last/complete-length.
		const ranged = await fetch(signed, { headers: { Range: 'bytes=100-1099' } });
		expect(ranged.status).toBe(206);
		expect(ranged.headers.get('content-range')).toBe(`bytes 100-1099/${original.length}`);
		const slice = Buffer.from(await ranged.arrayBuffer());
		expect(sha256(slice)).toBe(sha256(original.subarray(100, 1100)));
		expect(ranged.headers.get('content-disposition')).toMatch(
			/^attachment; filename\*=UTF-8''BCAM_0412\.mp4$/
		);

		const whole = await fetch(signed);
		expect(whole.status).toBe(200);
		expect(sha256(Buffer.from(await whole.arrayBuffer()))).toBe(sha256(original));

		const playback = await camera.request(`/api/footage/${footageId}/media/proxy`);
		expect(playback.status).toBe(302);
		const proxyUrl = playback.headers.get('location')!;
		expect(proxyUrl.startsWith(`${endpoint}/${BUCKET}/derived/${footageId}/`)).toBe(true);
		const proxyStart = await fetch(proxyUrl, { headers: { Range: 'bytes=0-7' } });
		expect(proxyStart.status).toBe(206);
		expect(proxyStart.headers.get('content-type')).toBe('video/mp4');
		// ISO BMFF (ISO/IEC 14496-12, from memory): a faststart MP4 opens with its `ftyp` box.
		expect(
			Buffer.from(await proxyStart.arrayBuffer())
				.subarray(4, 8)
				.toString('latin1')
		).toBe('ftyp');

		// The footage page may play and show media from the bucket's origin (CSP media-src, img-src).
		const [episode] = await query(`SELECT episode_id FROM footage WHERE id = $1`, [footageId]);
		const page = await camera.request(`/episodes/${episode.episode_id}/footage`);
		expect(page.status).toBe(200);
		const policy = page.headers.get('content-security-policy')!;
		expect(policy).toContain(`media-src 'self' ${endpoint}`);
		expect(policy).toContain(`img-src 'self' ${endpoint}`);
	}, 60_000);

	test('in Chromium the footage page plays the proxy from the bucket, with no CSP refusal', async () => {
		expect(footageId, 'the upload test ran first').not.toBe('');
		const browser = await openBrowser();
		try {
			const { page } = browser;
			const refusals: string[] = [];
			page.on('console', (message) => {
				if (/Content.Security.Policy/i.test(message.text())) refusals.push(message.text());
			});
			await page.goto(`${base}/signin`);
			await page.getByLabel('E-mail').fill(demo.camera);
			await page.getByLabel('Password').fill(DEMO_PASSWORD);
			await page.getByRole('button', { name: 'Sign in' }).click();
			await page.waitForURL((url) => !url.pathname.startsWith('/signin'));
			const [clip] = await query(`SELECT episode_id FROM footage WHERE id = $1`, [footageId]);
			await page.goto(`${base}/episodes/${clip.episode_id}/footage`);
			const row = page.locator('tr', { hasText: 'BCAM_0412' });
			await row.getByRole('button', { name: 'Play' }).click();
			const video = page.getByTestId('clip-player').locator('video');
			await expect
				.poll(() => video.evaluate((v: HTMLVideoElement) => v.readyState), { timeout: 20_000 })
				.toBeGreaterThanOrEqual(2);
			expect(await video.evaluate((v: HTMLVideoElement) => v.videoWidth)).toBe(320);
			expect(refusals).toEqual([]);
		} finally {
			await browser.close();
		}
	}, 90_000);

	test('a caller of another channel gets 404 and no address', async () => {
		expect(footageId, 'the upload test ran first').not.toBe('');
		const outsider = new Visitor(undefined, base);
		expect((await outsider.signIn(demo.otherProducer)).status).toBe(303);
		for (const url of [
			`/api/footage/${footageId}/file`,
			`/api/footage/${footageId}/media/proxy`,
			`/api/footage/${footageId}/media/poster`
		]) {
			const answer = await outsider.request(url);
			expect(answer.status, url).toBe(404);
			expect(answer.headers.get('location'), url).toBeNull();
			const body = await answer.text();
			expect(body, url).not.toContain(endpoint);
			expect(body, url).not.toContain('X-Amz');
		}
	});

	test('deleting the clip deletes its objects', async () => {
		expect(footageId, 'the upload test ran first').not.toBe('');
		const producer = new Visitor(undefined, base);
		await producer.signIn(demo.producer);
		const keys = [
			uploadId,
			...(
				await query(`SELECT storage_key FROM media_output WHERE footage_id = $1`, [footageId])
			).map((row) => row.storage_key as string)
		];
		expect(keys).toHaveLength(5);
		for (const key of keys) expect(await objectThere(key), key).toBe(true);
		const answer = await producer.request(`/api/footage/${footageId}`, { method: 'DELETE' });
		expect(answer.status).toBe(204);
		for (const key of keys) expect(await objectThere(key), key).toBe(false);
		expect(await query(`SELECT id FROM footage WHERE id = $1`, [footageId])).toEqual([]);
		expect(filesUnder(uploads)).toEqual([]);
	});
});

describe.skipIf(!existsSync(FFMPEG))('a bucket out of reach when an upload finishes', () => {
	let other: ChildProcess | null = null;
	afterAll(async () => {
		if (other) await stopServer(other);
	});

	test('the clip stays on disk, is recorded as such and served by the app with Range', async () => {
		// Nothing listens on this port: every request to the "store" is refused.
		const deadEndpoint = `http://127.0.0.1:${await freePort()}`;
		const port = await freePort();
		const there = `http://127.0.0.1:${port}`;
		other = startServer({
			...inject('serverEnv'),
			PORT: String(port),
			ORIGIN: there,
			DATABASE_URL: databaseUrl,
			UPLOAD_DIR: uploads,
			WRENCHROLL_MEDIA_WORKER: 'off',
			S3_ENDPOINT: deadEndpoint,
			S3_BUCKET: BUCKET,
			S3_ACCESS_KEY_ID: 'S3RVER',
			S3_SECRET_ACCESS_KEY: 'S3RVER',
			S3_FORCE_PATH_STYLE: 'true',
			AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true'
		});
		await waitForHttp(`${there}/healthz`, 30_000);
		const camera = new Visitor(undefined, there);
		expect((await camera.signIn(demo.camera)).status).toBe(303);
		const [episode] = await query(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`, []);
		const clip = makeClip(path.join(work, 'BCAM_0413.mp4'), {
			seconds: 1,
			size: '160x120',
			rate: '25',
			video: ['-c:v', 'libx264', '-preset', 'ultrafast']
		});
		const original = readFileSync(clip);
		const answered = await uploadClip(camera, there, clip, {
			episodeId: episode.id,
			clipName: 'BCAM_0413'
		});
		const [row] = await query(
			`SELECT id, upload_id, sha256, stored_in FROM footage WHERE upload_id = $1 OR id::text = $1`,
			[answered]
		);
		expect(row.stored_in).toBe('disk');
		expect(row.sha256).toBe(sha256(original)); // FIPS 180-4 through node:crypto
		expect(filesUnder(uploads)).toContain(row.upload_id);

		// RFC 9110 §14: the app answers the range itself, as for any clip on disk.
		const ranged = await camera.request(`/api/footage/${row.id}/file`, {
			headers: { Range: 'bytes=0-99' }
		});
		expect(ranged.status).toBe(206);
		expect(ranged.headers.get('location')).toBeNull();
		expect(ranged.headers.get('content-range')).toBe(`bytes 0-99/${original.length}`);
		expect(sha256(Buffer.from(await ranged.arrayBuffer()))).toBe(sha256(original.subarray(0, 100)));
	}, 120_000);
});

test('object storage settings with mistakes stop the server at start, naming each setting', async () => {
	const buildDir = path.resolve(
		import.meta.dirname,
		'../..',
		process.env.WRENCHROLL_BUILD_DIR ?? 'build'
	);
	const child = spawn(process.execPath, serverProcessArgs(buildDir), {
		env: {
			...inject('serverEnv'),
			PORT: String(await freePort()),
			UPLOAD_DIR: uploads,
			S3_ENDPOINT: 'the bay store',
			S3_BUCKET: BUCKET,
			S3_FORCE_PATH_STYLE: 'yes',
			AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true'
		},
		stdio: ['ignore', 'ignore', 'pipe']
	});
	let errors = '';
	child.stderr!.setEncoding('utf8').on('data', (text: string) => (errors += text));
	const code = await new Promise<number | null>((done) => child.once('exit', done));
	expect(code).not.toBe(0);
	expect(errors).toContain('S3_ENDPOINT must be the address of the store');
	expect(errors).toContain('S3_ACCESS_KEY_ID is required');
	expect(errors).toContain('S3_SECRET_ACCESS_KEY is required');
	expect(errors).toContain('S3_FORCE_PATH_STYLE must be true or false');
}, 60_000);
