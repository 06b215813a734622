/**
 * Media jobs outlive the process that runs them: the app sends jobs and runs none
 * (WRENCHROLL_MEDIA_WORKER=off), `npm run worker` (worker.js) takes them; a worker killed with
 * SIGKILL mid-proxy leaves its job to the next worker, which finishes it. And without ffmpeg on
 * the server, the footage page says so with the install line instead of waiting forever.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';
import { startServer, stopServer } from '../helpers/global-setup';
import { freePort, waitForHttp } from '../helpers/net';
import { dropScratchDatabase, scratchDatabase } from '../helpers/scratch-database';
import { FFMPEG, makeClip, probe, uploadClip, waitForOutputs } from '../helpers/media';

const root = path.resolve(import.meta.dirname, '../..');
const buildDir = path.resolve(root, process.env.WRENCHROLL_BUILD_DIR ?? 'build');
const DATABASE = 'wrenchroll_media_worker';
const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-media-worker-'));
const uploads = path.join(work, 'uploads');
const children: ChildProcess[] = [];
let databaseUrl = '';
let db: pg.Client;

const query = async (text: string, params: unknown[]) => (await db.query(text, params)).rows;

function startWorker(env: Record<string, string>): ChildProcess {
	const child = spawn(process.execPath, [path.join(root, 'worker.js'), buildDir], {
		env,
		stdio: ['ignore', 'ignore', 'inherit']
	});
	children.push(child);
	return child;
}

beforeAll(async () => {
	mkdirSync(uploads, { recursive: true });
	databaseUrl = await scratchDatabase(DATABASE, ['scripts/migrate.ts', 'scripts/seed.ts']);
	db = new pg.Client({ connectionString: databaseUrl });
	await db.connect();
}, 120_000);

afterAll(async () => {
	await Promise.all(children.map((child) => stopServer(child)));
	await db?.end();
	await dropScratchDatabase(DATABASE);
	rmSync(work, { recursive: true, force: true });
});

describe.skipIf(!existsSync(FFMPEG))('media jobs across processes', () => {
	test('a worker killed with SIGKILL mid-proxy: the next worker takes the job over and finishes it', async () => {
		const port = await freePort();
		const base = `http://127.0.0.1:${port}`;
		const env = {
			...inject('serverEnv'),
			PORT: String(port),
			ORIGIN: base,
			DATABASE_URL: databaseUrl,
			UPLOAD_DIR: uploads,
			WRENCHROLL_MEDIA_WORKER: 'off',
			WRENCHROLL_MEDIA_STALE_SECONDS: '4'
		};
		const server = startServer(env);
		children.push(server);
		await waitForHttp(`${base}/healthz`, 30_000);
		const camera = new Visitor(undefined, base);
		expect((await camera.signIn(demo.camera)).status).toBe(303);
		const [episode] = await query(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`, []);
		// Long enough that its proxy takes a few seconds to make, so the kill lands mid-job.
		const clip = makeClip(path.join(work, 'ACAM_3001.mp4'), {
			seconds: 30,
			size: '640x360',
			rate: '30000/1001',
			video: ['-c:v', 'libx264', '-preset', 'ultrafast', '-g', '30']
		});
		const footageId = await uploadClip(camera, base, clip, {
			episodeId: episode.id,
			cameraLabel: 'A cam',
			clipName: 'ACAM_3001'
		});
		const [row] = await query(`SELECT id FROM footage WHERE upload_id = $1 OR id::text = $1`, [
			footageId
		]);
		const id: string = row.id;

		// Nothing runs the job until a worker starts (the app process only sends it).
		await new Promise((done) => setTimeout(done, 1500));
		const [queued] = await query(
			`SELECT state FROM media_output WHERE footage_id = $1 AND kind = 'proxy'`,
			[id]
		);
		expect(queued.state).toBe('waiting');

		const first = startWorker(env);
		const deadline = Date.now() + 90_000;
		for (;;) {
			const [proxy] = await query(
				`SELECT state, progress FROM media_output WHERE footage_id = $1 AND kind = 'proxy'`,
				[id]
			);
			if (proxy.state === 'working' && proxy.progress > 0.02) break;
			expect(proxy.state, 'the proxy finished before the kill: make the clip longer').not.toBe(
				'done'
			);
			expect(Date.now()).toBeLessThan(deadline);
			await new Promise((done) => setTimeout(done, 100));
		}
		first.kill('SIGKILL');
		await new Promise((done) => first.once('exit', done));

		startWorker(env);
		const outputs = await waitForOutputs(id, query, 150_000);
		expect(outputs.proxy.state, outputs.proxy.message).toBe('done');
		expect(outputs.proxy.attempts).toBeGreaterThanOrEqual(2);
		const made = path.join(uploads, outputs.proxy.storage_key);
		expect(Number(probe(made).format.duration)).toBeCloseTo(30, 0);
		// No half-made file is left beside it.
		expect(readdirSync(path.dirname(made)).filter((name) => name.includes('.part-'))).toEqual([]);
	}, 300_000);
});

test('without ffmpeg on the server, the outputs say so with the install line', async () => {
	const port = await freePort();
	const base = `http://127.0.0.1:${port}`;
	const server = startServer({
		...inject('serverEnv'),
		PORT: String(port),
		ORIGIN: base,
		FFMPEG_PATH: path.join(work, 'no-ffmpeg-here')
	});
	children.push(server);
	await waitForHttp(`${base}/healthz`, 30_000);
	const camera = await signedIn(demo.camera);
	const there = new Visitor(undefined, base);
	there.cookies = camera.cookies;
	const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`);
	const clip = existsSync(FFMPEG)
		? makeClip(path.join(work, 'CCAM_0001.mp4'), {
				seconds: 1,
				size: '320x240',
				rate: '25',
				video: ['-c:v', 'libx264', '-preset', 'ultrafast']
			})
		: null;
	if (!clip) return;
	const id = await uploadClip(there, base, clip, {
		episodeId: episode.id,
		cameraLabel: 'C cam',
		clipName: 'CCAM_0001'
	});
	const outputs = await waitForOutputs(id);
	expect(outputs.proxy.state).toBe('skipped');
	expect(outputs.proxy.message).toContain('apt-get install ffmpeg');
	const page = await (await there.request(`/episodes/${episode.id}/footage`)).text();
	expect(page).toContain('apt-get install ffmpeg');
}, 120_000);
