/**
 * PostgreSQL going away and coming back, with the real cluster the test server uses: while it is
 * down the API answers 503 `{ error }` with Retry-After (RFC 9110 §15.6.4 503 Service Unavailable,
 * §10.2.3 Retry-After), pages show the app's own error page in the crew's words, and /healthz says
 * the database is what is down; a database that accepts connections but never answers gives the
 * same answers after the connection timeout instead of hanging; and once it is back the same server
 * process answers normally, with no restart.
 *
 * The cluster is stopped and started with the same options global setup used (same data folder,
 * port and socket folder), and afterAll brings it back and waits until the server answers again, so
 * the test files after this one find everything as it was.
 */
import { createServer, type Server, type Socket } from 'node:net';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { startCluster } from '../../scripts/lib/postgres';
import { Visitor, demo, signedIn } from '../helpers/http';
import { waitForHttp } from '../helpers/net';

const base = inject('baseUrl');
const databaseUrl = new URL(inject('databaseUrl'));
let clusterOptions: Parameters<typeof startCluster>[0];
let producer: Visitor;
let token = '';
let episodeId = '';
let trackedCode = '';
let silent: { server: Server; sockets: Set<Socket> } | null = null;

/** Starts the cluster if it is stopped (and answers its handle either way). */
const cluster = () => startCluster(clusterOptions);

async function databaseIsBack() {
	await silentStop();
	await cluster();
	await waitForHttp(`${base}/healthz`, 60_000);
	// The server's pool reconnects on its own: the next signed-in request works.
	for (let attempt = 0; attempt < 50; attempt++) {
		if ((await producer.request('/api/me')).status === 200) return;
		await new Promise((resolve) => setTimeout(resolve, 200));
	}
	throw new Error('the server did not answer /api/me after the database came back');
}

async function silentStop() {
	if (!silent) return;
	for (const socket of silent.sockets) socket.destroy();
	await new Promise((resolve) => silent!.server.close(resolve));
	silent = null;
}

beforeAll(async () => {
	const admin = new pg.Client({ connectionString: inject('databaseUrl') });
	await admin.connect();
	try {
		const [{ data_directory }] = (await admin.query('SHOW data_directory')).rows;
		// startCluster keeps the cluster in <dataDir>/data and its socket in <dataDir>/sockets.
		clusterOptions = {
			dataDir: path.dirname(data_directory),
			port: Number(databaseUrl.port),
			database: databaseUrl.pathname.slice(1)
		};
		episodeId = (await admin.query(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`))
			.rows[0].id;
		trackedCode = (await admin.query(`SELECT code FROM tracked_link LIMIT 1`)).rows[0].code;
	} finally {
		await admin.end();
	}
	producer = await signedIn(demo.producer);
	const created = await producer.api('/api/tokens', {
		method: 'POST',
		json: { label: 'outage check' }
	});
	expect(created.status).toBe(201);
	token = created.body.token.token;
});

afterAll(databaseIsBack, 120_000);

/** A request that may not hang: a server that never answers fails the test instead of stalling it. */
const within = () => AbortSignal.timeout(30_000);

async function expectApiOutage(response: Response) {
	expect(response.status).toBe(503);
	expect(Number(response.headers.get('retry-after'))).toBeGreaterThan(0);
	const body = await response.json();
	expect(body).toEqual({ error: expect.stringMatching(/database/i) });
	expect(body.error).not.toMatch(/ECONNREFUSED|127\.0\.0\.1|timeout exceeded/);
}

async function expectPageOutage(response: Response) {
	expect(response.status).toBe(503);
	expect(Number(response.headers.get('retry-after'))).toBeGreaterThan(0);
	const html = await response.text();
	// The app's own error page (src/routes/+error.svelte): its heading and way back, in our words.
	expect(html).toContain('Records are out of reach');
	expect(html).toContain('Back to the bench');
	expect(html).toMatch(/nothing you saved is lost/i);
	expect(html).not.toMatch(/Internal Error|ECONNREFUSED/);
}

describe('while PostgreSQL is down', () => {
	beforeAll(async () => {
		(await cluster()).stop(); // pg_ctl stop -m fast -w: returns once the server is down
	});

	test('the API answers 503 { error } with Retry-After, signed in by session or by token', async () => {
		await expectApiOutage(
			await fetch(`${base}/api/me`, {
				headers: { cookie: producer.cookieHeader() },
				signal: within()
			})
		);
		await expectApiOutage(
			await fetch(`${base}/api/me`, {
				headers: { authorization: `Bearer ${token}` },
				signal: within()
			})
		);
		// A page asked for with a token: the fallback error page (src/error.html), still a 503.
		const tokenPage = await fetch(`${base}/episodes`, {
			headers: { authorization: `Bearer ${token}`, accept: 'text/html' },
			signal: within()
		});
		expect(tokenPage.status).toBe(503);
		expect(await tokenPage.text()).toMatch(/reach its database/);
		await expectApiOutage(
			await fetch(`${base}/api/crew`, {
				method: 'POST',
				headers: {
					cookie: producer.cookieHeader(),
					origin: base,
					'content-type': 'application/json'
				},
				body: JSON.stringify({ email: 'later@example.test', name: 'Later', roles: ['host'] }),
				signal: within()
			})
		);
	});

	test('pages show the app’s error page saying the records are out of reach, with 503', async () => {
		for (const page of ['/', '/episodes', `/episodes/${episodeId}/rundown`])
			await expectPageOutage(
				await fetch(`${base}${page}`, {
					headers: { cookie: producer.cookieHeader(), accept: 'text/html' },
					signal: within()
				})
			);
		// A form action (use:enhance) gets 503 too, not a 500.
		const action = await fetch(`${base}/crew?/invite`, {
			method: 'POST',
			headers: {
				cookie: producer.cookieHeader(),
				origin: base,
				accept: 'application/json',
				'x-sveltekit-action': 'true',
				'content-type': 'application/x-www-form-urlencoded'
			},
			body: new URLSearchParams({ email: 'later@example.test', name: 'Later', roles: 'host' }),
			signal: within()
		});
		expect(action.status).toBe(503);
	});

	test('a form sent without JavaScript, a public page that reads the database, and sign-in also answer 503', async () => {
		const plainForm = await fetch(`${base}/crew?/invite`, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				cookie: producer.cookieHeader(),
				origin: base,
				accept: 'text/html',
				'content-type': 'application/x-www-form-urlencoded'
			},
			body: new URLSearchParams({ email: 'later@example.test', name: 'Later', roles: 'host' }),
			signal: within()
		});
		await expectPageOutage(plainForm);
		// A reset link is read from the database by the page's own load (signed out).
		await expectPageOutage(
			await fetch(`${base}/reset/${'a'.repeat(43)}`, {
				headers: { accept: 'text/html' },
				signal: within()
			})
		);
		const signIn = await fetch(`${base}/signin`, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				origin: base,
				accept: 'text/html',
				'content-type': 'application/x-www-form-urlencoded'
			},
			body: new URLSearchParams({ email: demo.host, password: 'wrenchroll-demo-bay3' }),
			signal: within()
		});
		// Not "that e-mail and password don't match": the password was never checked.
		await expectPageOutage(signIn);
	});

	test('a viewer following a tracked link gets 503 with a page in our words', async () => {
		const response = await fetch(`${base}/go/${trackedCode}`, {
			redirect: 'manual',
			headers: { accept: 'text/html' },
			signal: within()
		});
		expect(response.status).toBe(503);
		expect(response.headers.get('retry-after')).toBeTruthy();
		expect(await response.text()).toMatch(/out of reach for a moment/);
	});

	test('/healthz answers 503 and names the database', async () => {
		const response = await fetch(`${base}/healthz`, { signal: within() });
		expect(response.status).toBe(503);
		expect(response.headers.get('cache-control')).toContain('no-store');
		expect(await response.json()).toMatchObject({ status: 'down', database: 'down' });
	});
});

describe('while the database port accepts connections but nothing answers', () => {
	beforeAll(async () => {
		const sockets = new Set<Socket>();
		const server = createServer((socket) => {
			sockets.add(socket);
			socket.on('close', () => sockets.delete(socket));
		});
		await new Promise<void>((resolve, reject) => {
			server.once('error', reject);
			server.listen(Number(databaseUrl.port), '127.0.0.1', resolve);
		});
		silent = { server, sockets };
	});

	test('the API, pages and /healthz answer 503 after the connection timeout instead of hanging', async () => {
		await expectApiOutage(
			await fetch(`${base}/api/me`, {
				headers: { cookie: producer.cookieHeader() },
				signal: within()
			})
		);
		await expectPageOutage(
			await fetch(`${base}/episodes`, {
				headers: { cookie: producer.cookieHeader(), accept: 'text/html' },
				signal: within()
			})
		);
		const health = await fetch(`${base}/healthz`, { signal: within() });
		expect(health.status).toBe(503);
		expect(await health.json()).toMatchObject({ database: 'down' });
	});
});

describe('once PostgreSQL is back', () => {
	beforeAll(databaseIsBack, 120_000);

	test('the same server answers normally without a restart', async () => {
		const health = await fetch(`${base}/healthz`);
		expect(health.status).toBe(200);
		expect(await health.json()).toMatchObject({ status: 'ok', database: 'up' });
		expect((await producer.api('/api/me')).status).toBe(200);
		const byToken = await fetch(`${base}/api/me`, {
			headers: { authorization: `Bearer ${token}` }
		});
		expect(byToken.status).toBe(200);
		const page = await producer.request('/episodes', { headers: { accept: 'text/html' } });
		expect(page.status).toBe(200);
	});
});
