/**
 * Two app processes and one media worker on the same PostgreSQL and the same upload folder, as a
 * deployment behind a load balancer runs them:
 * - an upload started on process A, whose process is killed with SIGKILL in the middle of a PATCH,
 *   resumes on process B from the offset B reports and finishes with the file's own SHA-256
 *   (tus 1.0.0 core protocol, https://tus.io/protocols/resumable-upload: HEAD answers
 *   Upload-Offset, the client then PATCHes from that offset; a PATCH answers 204 with the new one);
 * - mail queued while both processes run their senders arrives exactly once;
 * - the app processes run no media job (WRENCHROLL_MEDIA_WORKER unset) and the worker makes each
 *   output exactly once.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { statSync } from 'node:fs';
import http from 'node:http';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { Visitor, demo } from '../helpers/http';
import { startServer, stopServer } from '../helpers/global-setup';
import { freePort, waitForHttp } from '../helpers/net';
import { dropScratchDatabase, scratchDatabase } from '../helpers/scratch-database';
import { FFMPEG, makeClip, waitForOutputs } from '../helpers/media';
import { startFakeMail, type FakeMail } from '../../scripts/lib/fake-mail';

const root = path.resolve(import.meta.dirname, '../..');
const buildDir = path.resolve(root, process.env.WRENCHROLL_BUILD_DIR ?? 'build');
const DATABASE = 'wrenchroll_two_processes';
const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-two-processes-'));
const uploads = path.join(work, 'uploads');
const mailbox = path.join(work, 'mail');
const children: ChildProcess[] = [];
let db: pg.Client;
let mail: FakeMail;
let shared: Record<string, string> = {};

const query = async (text: string, params: unknown[]) => (await db.query(text, params)).rows;
const TUS = { 'Tus-Resumable': '1.0.0' };
const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');
const pause = (ms: number) => new Promise((done) => setTimeout(done, ms));

async function startApp(): Promise<{ base: string; child: ChildProcess }> {
	const port = await freePort();
	const base = `http://127.0.0.1:${port}`;
	const child = startServer({ ...shared, PORT: String(port), ORIGIN: base });
	children.push(child);
	await waitForHttp(`${base}/healthz`, 30_000);
	return { base, child };
}

function startWorker(): ChildProcess {
	const child = spawn(process.execPath, [path.join(root, 'worker.js'), buildDir], {
		env: shared,
		stdio: ['ignore', 'ignore', 'inherit']
	});
	children.push(child);
	return child;
}

beforeAll(async () => {
	mkdirSync(uploads, { recursive: true });
	const databaseUrl = await scratchDatabase(DATABASE, ['scripts/migrate.ts', 'scripts/seed.ts']);
	db = new pg.Client({ connectionString: databaseUrl });
	await db.connect();
	mail = await startFakeMail({ port: await freePort(), dir: mailbox });
	shared = {
		...inject('serverEnv'),
		DATABASE_URL: databaseUrl,
		UPLOAD_DIR: uploads,
		SMTP_URL: mail.url,
		DEV_MAILBOX_DIR: mailbox,
		MAIL_INTERVAL_MS: '200',
		WRENCHROLL_MEDIA_STALE_SECONDS: '6'
	};
	// As in production: the app processes only send media jobs; the worker runs them.
	delete shared.WRENCHROLL_MEDIA_WORKER;
}, 120_000);

afterAll(async () => {
	await Promise.all(children.map((child) => stopServer(child)));
	await db?.end();
	await mail?.close();
	await dropScratchDatabase(DATABASE);
	rmSync(work, { recursive: true, force: true });
});

/** Sends `bytes` as one PATCH at `offset`; answers the status and the new Upload-Offset. */
async function patch(
	base: string,
	cookie: string,
	location: string,
	offset: number,
	bytes: Buffer
) {
	const response = await fetch(base + location, {
		method: 'PATCH',
		headers: {
			...TUS,
			cookie,
			'Upload-Offset': String(offset),
			'Content-Type': 'application/offset+octet-stream'
		},
		body: new Uint8Array(bytes)
	});
	return { status: response.status, offset: Number(response.headers.get('upload-offset')) };
}

/**
 * Starts a PATCH that declares `bytes.length` but sends only its first `sent` bytes, then stalls,
 * as a camera operator's laptop does when the connection drops.
 */
function stalledPatch(
	base: string,
	cookie: string,
	location: string,
	offset: number,
	bytes: Buffer,
	sent: number
) {
	const request = http.request(base + location, {
		method: 'PATCH',
		headers: {
			...TUS,
			cookie,
			'Upload-Offset': String(offset),
			'Content-Type': 'application/offset+octet-stream',
			'Content-Length': String(bytes.length)
		}
	});
	const ended = new Promise<string>((resolve) => {
		request.on('response', (response) => resolve(`answered ${response.statusCode}`));
		request.on('error', (failure) => resolve(failure.message));
	});
	request.write(bytes.subarray(0, sent));
	return { request, ended };
}

describe.skipIf(!existsSync(FFMPEG))('two app processes and one worker', () => {
	test('an upload whose process is killed mid-PATCH resumes on the other process with the right SHA-256; mail goes once; each output is made once by the worker', async () => {
		const a = await startApp();
		const b = await startApp();

		// Mail queued while both processes' senders run (every 200 ms): each goes out exactly once.
		// (Before the kill: a sender killed between the mail server's acceptance and its own record
		// sends that message again once its claim runs out, with the same Message-ID; DEVELOPERS.md.)
		const subjects = Array.from({ length: 24 }, (_, n) => `Two-process check ${n + 1}`);
		for (const subject of subjects)
			await query(`INSERT INTO outbox (to_address, subject, body_text) VALUES ($1, $2, $3)`, [
				'crew@bay.test',
				subject,
				`Sent once: ${subject}`
			]);

		// Mail: every row sent, each with one attempt, and one message each in the mailbox.
		const delivered = () =>
			readdirSync(mailbox)
				.filter((name) => name.endsWith('.json'))
				.map((name) => JSON.parse(readFileSync(path.join(mailbox, name), 'utf8')).subject)
				.filter((subject: string) => subjects.includes(subject));
		for (const deadline = Date.now() + 20_000; delivered().length < subjects.length;) {
			expect(Date.now(), 'mail still not delivered').toBeLessThan(deadline);
			await pause(200);
		}
		await pause(1000); // several more rounds of both senders
		expect(delivered().sort()).toEqual([...subjects].sort());
		const sent = await query(
			`SELECT attempts, sent_at, last_error FROM outbox WHERE subject LIKE 'Two-process check %'`,
			[]
		);
		expect(sent).toHaveLength(subjects.length);
		expect(sent.filter((row) => !(row.sent_at !== null && row.attempts === 1))).toEqual([]);

		const camera = new Visitor(undefined, a.base);
		expect((await camera.signIn(demo.camera)).status).toBe(303);
		const cookie = camera.cookieHeader();
		const [episode] = await query(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`, []);
		const clip = makeClip(path.join(work, 'BCAM_0420.mov'), {
			seconds: 4,
			size: '640x360',
			rate: '30000/1001',
			video: ['-c:v', 'libx264', '-preset', 'ultrafast', '-qp', '10'],
			audio: ['-c:a', 'pcm_s16le'],
			toneHz: 1000
		});
		const bytes = readFileSync(clip);
		const size = bytes.length;
		expect(size).toBeGreaterThan(300_000);

		// Created and partly sent on A.
		const metadata = Object.entries({
			episodeId: episode.id,
			filename: 'BCAM_0420.mov',
			filetype: 'video/quicktime',
			clipName: 'BCAM_0420',
			cameraLabel: 'B cam'
		})
			.map(([key, value]) => `${key} ${Buffer.from(value).toString('base64')}`)
			.join(',');
		const created = await fetch(`${a.base}/api/uploads`, {
			method: 'POST',
			headers: { ...TUS, cookie, 'Upload-Length': String(size), 'Upload-Metadata': metadata }
		});
		expect(created.status).toBe(201);
		const location = new URL(created.headers.get('location')!, a.base).pathname;
		const uploadId = location.split('/').pop()!;
		const firstCut = Math.floor(size / 3);
		const first = await patch(a.base, cookie, location, 0, bytes.subarray(0, firstCut));
		expect(first).toEqual({ status: 204, offset: firstCut });

		// A second PATCH on A stalls part-way; A is killed while it holds the upload's lock.
		const rest = bytes.subarray(firstCut);
		const stalled = stalledPatch(a.base, cookie, location, firstCut, rest, 100_000);
		const file = path.join(uploads, uploadId);
		for (const deadline = Date.now() + 15_000; statSync(file).size < firstCut + 100_000;) {
			expect(Date.now(), 'the stalled PATCH never reached the file').toBeLessThan(deadline);
			await pause(50);
		}
		a.child.kill('SIGKILL');
		await new Promise((done) => a.child.once('exit', done));
		expect(await stalled.ended).not.toMatch(/^answered/);

		// B reports where the file stands (tus HEAD: Upload-Offset, Upload-Length) and takes the rest.
		const head = await fetch(b.base + location, { method: 'HEAD', headers: { ...TUS, cookie } });
		expect(head.status).toBe(200);
		expect(head.headers.get('upload-length')).toBe(String(size));
		const resumeAt = Number(head.headers.get('upload-offset'));
		expect(resumeAt).toBe(firstCut + 100_000);
		const last = await patch(b.base, cookie, location, resumeAt, bytes.subarray(resumeAt));
		expect(last).toEqual({ status: 204, offset: size });

		// The footage row: one, with the whole file's SHA-256 (hashed from disk: B never saw the start).
		const rows = await query(`SELECT id, sha256, size_bytes FROM footage WHERE upload_id = $1`, [
			uploadId
		]);
		expect(rows).toHaveLength(1);
		expect(rows[0].sha256).toBe(sha256(bytes));
		expect(Number(rows[0].size_bytes)).toBe(size);
		expect(sha256(readFileSync(file))).toBe(sha256(bytes));
		const footageId: string = rows[0].id;

		// No app process takes a media job: with the worker not yet started, every output waits.
		await pause(2000);
		const before = await query(`SELECT kind, state FROM media_output WHERE footage_id = $1`, [
			footageId
		]);
		expect(before.map((row) => row.kind).sort()).toEqual(['peaks', 'poster', 'proxy', 'sprite']);
		expect(before.every((row) => row.state === 'waiting')).toBe(true);

		startWorker();
		const outputs = await waitForOutputs(footageId, query, 150_000);
		for (const kind of ['proxy', 'poster', 'sprite', 'peaks']) {
			expect(outputs[kind].state, `${kind}: ${outputs[kind].message}`).toBe('done');
			expect(outputs[kind].attempts, `${kind} made more than once`).toBe(1);
			expect(existsSync(path.join(uploads, outputs[kind].storage_key))).toBe(true);
		}
		// One pg-boss job per output, each completed on its first run.
		const jobs = await query(
			`SELECT data->>'kind' AS kind, state, retry_count FROM pgboss.job
			 WHERE name = 'media-output' AND data->>'footageId' = $1`,
			[footageId]
		);
		expect(jobs.map((job) => job.kind).sort()).toEqual(['peaks', 'poster', 'proxy', 'sprite']);
		expect(jobs.every((job) => job.state === 'completed' && job.retry_count === 0)).toBe(true);
		const derived = path.dirname(path.join(uploads, outputs.proxy.storage_key));
		expect(readdirSync(derived).filter((name) => name.includes('.part-'))).toEqual([]);

		// The kill did not make the earlier mail go again.
		expect(delivered().sort()).toEqual([...subjects].sort());
	}, 300_000);
});
