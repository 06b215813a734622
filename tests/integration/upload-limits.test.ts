/**
 * Limits on resumable uploads, over HTTP against the built server, per tus 1.0.0
 * (https://tus.io/protocols/resumable-upload): a channel's storage quota and the upload disk's free
 * space are checked when an upload is created (Creation extension; 413 and 507 with a body that
 * says what to do), a deferred length (Upload-Defer-Length) is recorded once known, and unfinished
 * uploads expire (Expiration extension: Upload-Expires in RFC 7231 date format) and are swept.
 * No test fills the disk: uploads only declare their lengths.
 */
import type { ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync, statfsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { afterAll, afterEach, beforeAll, describe, expect, inject, test } from 'vitest';
import { DEMO_PASSWORD, demo, signedIn, sql } from '../helpers/http';
import { startServer, stopServer } from '../helpers/global-setup';
import { dropScratchDatabase, scratchDatabase } from '../helpers/scratch-database';
import { freePort, waitForHttp } from '../helpers/net';

const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-upload-limits-'));
const GB = 1e9; // decimal gigabyte, as disk makers and the settings page count
const servers: ChildProcess[] = [];
let episodeId = '';
let channelId = '';

const b64 = (value: string) => Buffer.from(value).toString('base64');
const metadata = (fields: Record<string, string>) =>
	Object.entries(fields)
		.map(([key, value]) => `${key} ${b64(value)}`)
		.join(',');
const clip = (name: string) => metadata({ filename: name, filetype: 'video/mp4', episodeId });

beforeAll(async () => {
	const [episode] = await sql(
		`SELECT id, channel_id FROM episode WHERE slug = 'mule-rear-block-lift'`
	);
	episodeId = episode.id;
	channelId = episode.channel_id;
});
afterEach(async () => {
	await Promise.all(servers.splice(0).map((server) => stopServer(server)));
});
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** A signed-in caller of a server other than the shared one (tus requests with its cookie). */
async function callerAt(base: string, email: string) {
	const signIn = await fetch(`${base}/signin`, {
		method: 'POST',
		redirect: 'manual',
		headers: {
			origin: base,
			accept: 'text/html',
			'content-type': 'application/x-www-form-urlencoded'
		},
		body: new URLSearchParams({ email, password: DEMO_PASSWORD })
	});
	expect(signIn.status).toBe(303);
	const cookie = signIn.headers
		.getSetCookie()
		.map((line) => line.split(';')[0])
		.join('; ');
	return (pathname: string, init: RequestInit = {}) =>
		fetch(base + pathname, {
			...init,
			headers: { ...(init.headers as Record<string, string>), cookie, origin: base }
		});
}

async function startSecondServer(env: Record<string, string>) {
	const port = await freePort();
	const base = `http://127.0.0.1:${port}`;
	const server = startServer({ ...inject('serverEnv'), PORT: String(port), ORIGIN: base, ...env });
	servers.push(server);
	await waitForHttp(`${base}/healthz`, 30_000);
	return base;
}

const create = (
	call: (pathname: string, init?: RequestInit) => Promise<Response>,
	length: number | 'deferred',
	name = 'bay3-limit.mp4'
) =>
	call('/api/uploads', {
		method: 'POST',
		headers: {
			'Tus-Resumable': '1.0.0',
			...(length === 'deferred'
				? { 'Upload-Defer-Length': '1' }
				: { 'Upload-Length': String(length) }),
			'Upload-Metadata': clip(name)
		}
	});

const terminate = (
	call: (pathname: string, init?: RequestInit) => Promise<Response>,
	url: string
) => call(url, { method: 'DELETE', headers: { 'Tus-Resumable': '1.0.0' } });

/** What the channel holds: finished footage, plus the declared length of each unfinished upload. */
async function channelUsage(): Promise<number> {
	const [row] = await sql(
		`SELECT (SELECT coalesce(sum(size_bytes), 0) FROM footage WHERE channel_id = $1)
		      + (SELECT coalesce(sum(size_bytes), 0) FROM upload WHERE channel_id = $1 AND completed_at IS NULL) AS used`,
		[channelId]
	);
	return Number(row.used);
}

describe('the channel storage quota (checked at creation, tus 1.0.0 Creation)', () => {
	test('a producer sets the quota under Channel settings; a word where a number belongs gets a field message and nothing changes', async () => {
		const producer = await signedIn(demo.producer);
		const page = await (await producer.request('/channel')).text();
		expect(page).toContain('Storage quota');
		const { body } = await producer.api('/api/channel');
		const before = body.channel;
		expect(before.storageQuotaGb).toBe(2000); // the default: 2 TB
		const form = {
			name: before.name,
			frameRate: before.frameRate,
			callToAction: before.callToAction,
			contact: before.contact,
			descriptionLimit: String(before.descriptionLimit),
			version: String(before.version)
		};
		const bad = await producer.action('/channel?/save', { ...form, storageQuotaGb: 'plenty' });
		expect(bad.status).toBe(400);
		expect(bad.data.errors.storageQuotaGb[0]).toMatch(/gigabytes/i);
		expect(bad.data.values.storageQuotaGb).toBe('plenty'); // what was typed stays in the field
		const saved = await producer.action('/channel?/save', { ...form, storageQuotaGb: '3000' });
		expect(saved.type).toBe('success');
		expect((await producer.api('/api/channel')).body.channel.storageQuotaGb).toBe(3000);
		const { body: after } = await producer.api('/api/channel');
		const restored = await producer.api('/api/channel', {
			method: 'PATCH',
			json: { ...after.channel, storageQuotaGb: 2000 }
		});
		expect(restored.status).toBe(200);
		// Only a producer changes it.
		const camera = await signedIn(demo.camera);
		const refused = await camera.api('/api/channel', {
			method: 'PATCH',
			json: { ...restored.body.channel, storageQuotaGb: 1 }
		});
		expect(refused.status).toBe(403);
	});

	test('an upload that would pass the quota answers 413 with what to do and stores nothing; unfinished uploads count at their declared length', async () => {
		const producer = await signedIn(demo.producer);
		const camera = await signedIn(demo.camera);
		const call = (pathname: string, init?: RequestInit) => camera.request(pathname, init);
		const used = await channelUsage();
		const quotaGb = Math.ceil(used / GB) + 1;
		const room = quotaGb * GB - used; // between 1 GB and 2 GB
		const { body } = await producer.api('/api/channel');
		const original = body.channel.storageQuotaGb ?? 2000;
		const set = await producer.api('/api/channel', {
			method: 'PATCH',
			json: { ...body.channel, storageQuotaGb: quotaGb }
		});
		expect(set.status).toBe(200);
		const opened: string[] = [];
		try {
			const declared = Math.ceil(room * 0.6);
			const first = await create(call, declared);
			expect(first.status).toBe(201);
			opened.push(first.headers.get('location')!);

			// Nothing was sent yet, but the first upload's declared length is spoken for.
			const uploadsBefore = await sql(`SELECT count(*)::int AS n FROM upload`);
			const second = await create(call, declared);
			expect(second.status).toBe(413); // RFC 9110 §15.5.14 Content Too Large
			expect(second.headers.get('tus-resumable')).toBe('1.0.0'); // on every response but OPTIONS
			const message = await second.text();
			expect(message).toMatch(/storage quota/i);
			expect(message).toMatch(/Channel settings/);
			expect(message).toMatch(/Nothing was stored/);
			expect(await sql(`SELECT count(*)::int AS n FROM upload`)).toEqual(uploadsBefore);

			// An upload of unknown length (tus Upload-Defer-Length) counts at the largest size allowed.
			const deferred = await create(call, 'deferred');
			expect(deferred.status).toBe(413);
			expect(await deferred.text()).toMatch(/did not say its size/);

			// Terminating the first (tus Termination) gives its room back.
			expect((await terminate(call, opened.pop()!)).status).toBe(204);
			const third = await create(call, declared);
			expect(third.status).toBe(201);
			opened.push(third.headers.get('location')!);
		} finally {
			for (const url of opened) await terminate(call, url);
			const { body: now } = await producer.api('/api/channel');
			await producer.api('/api/channel', {
				method: 'PATCH',
				json: { ...now.channel, storageQuotaGb: original }
			});
		}
	});
});

describe('Upload-Defer-Length (tus 1.0.0 Creation: the length is sent later)', () => {
	test('an upload created without a length records its real size once it is known', async () => {
		const camera = await signedIn(demo.camera);
		const created = await create((p, init) => camera.request(p, init), 'deferred', 'bay3-live.wav');
		expect(created.status).toBe(201);
		const url = created.headers.get('location')!;
		const patch = (offset: number, bytes: string, length?: number) =>
			camera.request(url, {
				method: 'PATCH',
				headers: {
					'Tus-Resumable': '1.0.0',
					'Upload-Offset': String(offset),
					'Content-Type': 'application/offset+octet-stream',
					...(length === undefined ? {} : { 'Upload-Length': String(length) })
				},
				body: Buffer.from(bytes)
			});
		expect((await patch(0, 'torque')).status).toBe(204);
		// The last PATCH names the length (tus: "the Client MUST set the Upload-Length header in
		// the next PATCH request, once the length is known").
		const last = await patch(6, ' spec', 11);
		expect(last.status).toBe(204);
		expect(last.headers.get('upload-offset')).toBe('11');
		const id = url.split('/').pop();
		const [row] = await sql(`SELECT size_bytes FROM footage WHERE upload_id = $1`, [id]);
		expect(Number(row.size_bytes)).toBe(11);
		const [upload] = await sql(`SELECT size_bytes FROM upload WHERE id = $1`, [id]);
		expect(Number(upload.size_bytes)).toBe(11);
	});
});

describe('the free-space floor of the upload disk (checked at creation)', () => {
	test('an upload that would take the disk below its floor answers 507 with what to do; space promised to unfinished uploads counts', async () => {
		// A second server on the same database and upload disk, whose floor sits 1.5 uploads below
		// the space free now: one upload fits, a second does not. Lengths are only declared.
		const disk = statfsSync(inject('uploadDir'));
		const free = disk.bavail * disk.bsize;
		const declared = Math.floor(Math.min(20 * GB, free / 4));
		const base = await startSecondServer({
			UPLOAD_FREE_FLOOR: String(Math.floor(free - 1.5 * declared))
		});
		const call = await callerAt(base, demo.camera);
		// Four created at the same moment: checks and records happen one creation at a time, so
		// exactly one fits and the others count it.
		const attempts = await Promise.all(
			[1, 2, 3, 4].map((n) => create(call, declared, `bay3-floor-${n}.mp4`))
		);
		const accepted = attempts.filter((response) => response.status === 201);
		const refused = attempts.filter((response) => response.status !== 201);
		expect(accepted).toHaveLength(1);
		const url = accepted[0].headers.get('location')!;
		try {
			expect(refused.map((response) => response.status)).toEqual([507, 507, 507]); // RFC 4918 §11.5 Insufficient Storage
			expect(refused[0].headers.get('tus-resumable')).toBe('1.0.0');
			const message = await refused[0].text();
			expect(message).toMatch(/upload disk/i);
			expect(message).toMatch(/Nothing was stored/);
			expect(message).toMatch(/free space|larger disk/i);
		} finally {
			expect((await terminate(call, url)).status).toBe(204);
		}
		const again = await create(call, declared);
		expect(again.status).toBe(201);
		await terminate(call, again.headers.get('location')!);
	});
});

describe('expiration (tus 1.0.0 Expiration extension)', () => {
	const DATABASE = 'wrenchroll_upload_expiry';
	let databaseUrl = '';
	beforeAll(async () => {
		databaseUrl = await scratchDatabase(DATABASE, ['scripts/migrate.ts', 'scripts/seed.ts']);
	});
	afterAll(async () => {
		await Promise.all(servers.splice(0).map((server) => stopServer(server)));
		await dropScratchDatabase(DATABASE);
	});

	test('creation and PATCH send Upload-Expires as an RFC 7231 date; an expired partial upload is swept (file, sidecar, row) and a finished one stays', async () => {
		const uploadDir = path.join(work, 'expiring-uploads');
		// 0.001 h = 3.6 s: a server of its own with its own database and disk folder.
		const base = await startSecondServer({
			DATABASE_URL: databaseUrl,
			UPLOAD_DIR: uploadDir,
			UPLOAD_TTL_HOURS: '0.001'
		});
		const db = new pg.Client({ connectionString: databaseUrl });
		await db.connect();
		try {
			const {
				rows: [episode]
			} = await db.query(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`);
			const call = await callerAt(base, demo.camera);
			const createHere = (length: number, name: string) =>
				call('/api/uploads', {
					method: 'POST',
					headers: {
						'Tus-Resumable': '1.0.0',
						'Upload-Length': String(length),
						'Upload-Metadata': metadata({
							filename: name,
							filetype: 'video/mp4',
							episodeId: episode.id
						})
					}
				});
			const patch = (url: string, offset: number, bytes: string) =>
				call(url, {
					method: 'PATCH',
					headers: {
						'Tus-Resumable': '1.0.0',
						'Upload-Offset': String(offset),
						'Content-Type': 'application/offset+octet-stream'
					},
					body: Buffer.from(bytes)
				});

			const options = await fetch(`${base}/api/uploads`, { method: 'OPTIONS' });
			expect(options.headers.get('tus-extension')!.split(',')).toContain('expiration');

			const startedAt = Date.now();
			const partial = await createHere(100, 'bay3-abandoned.mp4');
			expect(partial.status).toBe(201);
			// RFC 7231 §7.1.1.1 IMF-fixdate, e.g. "Sun, 06 Nov 1994 08:49:37 GMT".
			const imfFixdate =
				/^(Mon|Tue|Wed|Thu|Fri|Sat|Sun), \d{2} (Jan|Feb|Mar|Apr|May|Jun|Jul|Aug|Sep|Oct|Nov|Dec) \d{4} \d{2}:\d{2}:\d{2} GMT$/;
			const expires = partial.headers.get('upload-expires')!;
			expect(expires).toMatch(imfFixdate);
			const expiresAt = Date.parse(expires);
			expect(expiresAt).toBeGreaterThan(startedAt + 2_000);
			expect(expiresAt).toBeLessThan(Date.now() + 5_000);
			const partialUrl = partial.headers.get('location')!;
			const partialId = partialUrl.split('/').pop()!;
			const patched = await patch(partialUrl, 0, 'half a clip');
			expect(patched.status).toBe(204);
			expect(patched.headers.get('upload-expires')).toBe(expires);

			const finished = await createHere(4, 'bay3-done.mp4');
			const finishedId = finished.headers.get('location')!.split('/').pop()!;
			expect((await patch(finished.headers.get('location')!, 0, 'done')).status).toBe(204);

			// After the expiry the sweep removes the partial upload: file, tus sidecar, and its row.
			const deadline = Date.now() + 30_000;
			const gone = () =>
				!existsSync(path.join(uploadDir, partialId)) &&
				!existsSync(path.join(uploadDir, `${partialId}.json`));
			while (!gone() && Date.now() < deadline)
				await new Promise((resolve) => setTimeout(resolve, 200));
			expect(gone()).toBe(true);
			expect(Date.now()).toBeGreaterThanOrEqual(expiresAt - 1_000); // not before it was due
			expect((await db.query(`SELECT 1 FROM upload WHERE id = $1`, [partialId])).rows).toEqual([]);
			const head = await call(partialUrl, {
				method: 'HEAD',
				headers: { 'Tus-Resumable': '1.0.0' }
			});
			expect([404, 410]).toContain(head.status); // tus: 404 Not Found or 410 Gone

			// The finished upload is footage now: its file and row stay.
			expect(readdirSync(uploadDir)).toContain(finishedId);
			const footage = await db.query(`SELECT size_bytes FROM footage WHERE upload_id = $1`, [
				finishedId
			]);
			expect(footage.rows).toHaveLength(1);
		} finally {
			await db.end();
		}
	});
});
