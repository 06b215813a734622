/**
 * Mail is never lost when SMTP is down: the message waits in the outbox with its error and is
 * delivered by the sender loop's retry once the mail server answers. Runs a second server against
 * its own database in the test cluster, so its outbox is its own.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { afterAll, expect, inject, test } from 'vitest';
import { startServer, stopServer } from '../helpers/global-setup';
import { freePort, waitForHttp } from '../helpers/net';
import { startFakeMail, type FakeMail } from '../../scripts/lib/fake-mail';
import { DEMO_PASSWORD, demo } from '../helpers/http';

const root = path.resolve(import.meta.dirname, '../..');
const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-outage-'));
let mail: FakeMail | null = null;
afterAll(async () => {
	await mail?.close();
	rmSync(work, { recursive: true, force: true });
});

test('an invite sent while SMTP is down is kept with its error and delivered after the server returns', async () => {
	const url = new URL(inject('databaseUrl'));
	const admin = new pg.Client({ connectionString: inject('databaseUrl') });
	await admin.connect();
	await admin.query('DROP DATABASE IF EXISTS wrenchroll_outage');
	await admin.query('CREATE DATABASE wrenchroll_outage');
	await admin.end();
	url.pathname = '/wrenchroll_outage';
	const tsx = path.join(root, 'node_modules/.bin/tsx');
	for (const script of ['scripts/migrate.ts', 'scripts/seed.ts']) {
		const result = spawnSync(tsx, [script], {
			cwd: root,
			env: { ...process.env, DATABASE_URL: url.toString() },
			encoding: 'utf8'
		});
		expect(result.status, result.stderr).toBe(0);
	}
	const smtpPort = await freePort(); // nothing listens here yet: SMTP is down
	const port = await freePort();
	const base = `http://127.0.0.1:${port}`;
	const mailbox = path.join(work, 'mail');
	const server = startServer({
		...inject('serverEnv'),
		PORT: String(port),
		ORIGIN: base,
		DATABASE_URL: url.toString(),
		SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
		DEV_MAILBOX_DIR: mailbox,
		MAIL_INTERVAL_MS: '300'
	});
	const db = new pg.Client({ connectionString: url.toString() });
	await db.connect();
	try {
		await waitForHttp(`${base}/healthz`, 30_000);
		const signIn = await fetch(`${base}/signin`, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				origin: base,
				accept: 'text/html',
				'content-type': 'application/x-www-form-urlencoded'
			},
			body: new URLSearchParams({ email: demo.producer, password: DEMO_PASSWORD })
		});
		const cookie = signIn.headers
			.getSetCookie()
			.map((c) => c.split(';')[0])
			.join('; ');
		const invited = await fetch(`${base}/api/crew`, {
			method: 'POST',
			headers: { cookie, origin: base, 'content-type': 'application/json' },
			body: JSON.stringify({ email: 'outage@example.test', name: 'Outage Test', roles: ['host'] })
		});
		expect(invited.status).toBe(201);

		// The sender tries, fails, and keeps the message with the reason.
		let row: { attempts: number; last_error: string | null; sent_at: Date | null } | undefined;
		for (let i = 0; i < 100 && !(row && row.attempts > 0); i++) {
			row = (
				await db.query(
					`SELECT attempts, last_error, sent_at FROM outbox WHERE to_address = 'outage@example.test'`
				)
			).rows[0];
			if (!(row && row.attempts > 0)) await new Promise((resolve) => setTimeout(resolve, 100));
		}
		expect(row?.attempts).toBeGreaterThan(0);
		expect(row?.last_error).toBeTruthy();
		expect(row?.sent_at).toBeNull();

		// The mail server comes back; the retry (5 s after the first failure) delivers it.
		mail = await startFakeMail({ port: smtpPort, dir: mailbox });
		let delivered: string[] = [];
		for (let i = 0; i < 150 && delivered.length === 0; i++) {
			delivered = readdirSync(mailbox).filter(
				(name) =>
					name.endsWith('.json') &&
					JSON.parse(readFileSync(path.join(mailbox, name), 'utf8')).to.includes(
						'outage@example.test'
					)
			);
			if (delivered.length === 0) await new Promise((resolve) => setTimeout(resolve, 200));
		}
		expect(delivered).toHaveLength(1);
		// The mail server stores the message before it answers, so the sender records it a moment later.
		let after: { sent_at: Date | null } = { sent_at: null };
		for (let i = 0; i < 50 && after.sent_at === null; i++) {
			after = (
				await db.query(`SELECT sent_at FROM outbox WHERE to_address = 'outage@example.test'`)
			).rows[0];
			if (after.sent_at === null) await new Promise((resolve) => setTimeout(resolve, 100));
		}
		expect(after.sent_at).not.toBeNull();
	} finally {
		await db.end();
		await stopServer(server);
	}
}, 90_000);
