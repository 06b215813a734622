/**
 * The mail sender holds no transaction while it talks to SMTP, gives up on a mail server that never
 * answers, and sends each outbox row with a stable Message-ID, so a resend after a crash is the same
 * message (RFC 5322 §3.6.4). Runs the built server against a database of its own in the test
 * cluster (its outbox is its own) and against mail servers started here on loopback.
 */
import type { ChildProcess } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { createServer, type Server, type Socket } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pg from 'pg';
import PostalMime from 'postal-mime';
import { SMTPServer } from 'smtp-server';
import { afterAll, afterEach, beforeAll, expect, inject, test } from 'vitest';
import { startServer, stopServer } from '../helpers/global-setup';
import { freePort, waitForHttp } from '../helpers/net';
import { dropScratchDatabase, scratchDatabase } from '../helpers/scratch-database';
import { startFakeMail, type FakeMail } from '../../scripts/lib/fake-mail';

const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-mail-sender-'));
const DATABASE = 'wrenchroll_mail_sender';
let databaseUrl = '';
let db: pg.Client;
const servers: ChildProcess[] = [];
const closers: (() => Promise<void>)[] = [];

const until = async <T>(
	probe: () => Promise<T>,
	done: (value: T) => boolean,
	timeoutMs: number
) => {
	const deadline = Date.now() + timeoutMs;
	let value = await probe();
	while (!done(value) && Date.now() < deadline) {
		await new Promise((resolve) => setTimeout(resolve, 100));
		value = await probe();
	}
	return value;
};

/** Starts the built server; `started` sees the process before it answers HTTP. */
async function startWrenchroll(
	smtpPort: number,
	extra: Record<string, string> = {},
	started: (server: ChildProcess) => void = () => undefined
) {
	const port = await freePort();
	const base = `http://127.0.0.1:${port}`;
	const server = startServer({
		...inject('serverEnv'),
		PORT: String(port),
		ORIGIN: base,
		DATABASE_URL: databaseUrl,
		SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
		MAIL_INTERVAL_MS: '200',
		...extra
	});
	servers.push(server);
	started(server);
	await waitForHttp(`${base}/healthz`, 30_000);
	return server;
}

beforeAll(async () => {
	databaseUrl = await scratchDatabase(DATABASE, ['scripts/migrate.ts']);
	db = new pg.Client({ connectionString: databaseUrl });
	await db.connect();
});

afterEach(async () => {
	await Promise.all(servers.splice(0).map((server) => stopServer(server)));
	for (const close of closers.splice(0)) await close();
	await db.query('DELETE FROM outbox');
});

afterAll(async () => {
	await db?.end();
	await dropScratchDatabase(DATABASE);
	rmSync(work, { recursive: true, force: true });
});

test('an SMTP server that accepts and never answers: the sender gives up on its timeout with no transaction open, and the mail goes out once a mail server answers', async () => {
	// A raw TCP listener on loopback that accepts connections and never sends the SMTP greeting
	// (RFC 5321 §3.1: the client waits for the 220 greeting before it says anything).
	const smtpPort = await freePort();
	const sockets = new Set<Socket>();
	let closedByClient = 0;
	let connected!: () => void;
	const firstConnection = new Promise<void>((resolve) => (connected = resolve));
	const stalled: Server = createServer((socket) => {
		sockets.add(socket);
		socket.on('error', () => undefined);
		socket.on('end', () => closedByClient++);
		socket.on('close', () => sockets.delete(socket));
		connected();
	});
	await new Promise<void>((resolve) => stalled.listen(smtpPort, '127.0.0.1', resolve));
	const closeStalled = () =>
		new Promise<void>((resolve) => {
			for (const socket of sockets) socket.destroy();
			stalled.close(() => resolve());
		});
	closers.push(async () => {
		if (stalled.listening) await closeStalled();
	});

	const recipients = ['stall-1@example.test', 'stall-2@example.test', 'stall-3@example.test'];
	for (const to of recipients)
		await db.query(
			`INSERT INTO outbox (to_address, subject, body_text) VALUES ($1, 'Call sheet', 'Bay 3 at seven.')`,
			[to]
		);
	await startWrenchroll(smtpPort, { SMTP_TIMEOUT_MS: '1000' });
	await firstConnection;

	// While the sender waits on the silent server, no session of its database sits idle inside a
	// transaction (PostgreSQL's pg_stat_activity.state 'idle in transaction').
	let idleInTransaction = 0;
	const failed = await until(
		async () => {
			const idle = await db.query(
				`SELECT count(*)::int AS n FROM pg_stat_activity
				 WHERE datname = $1 AND pid <> pg_backend_pid() AND state LIKE 'idle in transaction%'`,
				[DATABASE]
			);
			idleInTransaction = Math.max(idleInTransaction, idle.rows[0].n);
			return (
				await db.query(
					`SELECT to_address, attempts, last_error FROM outbox WHERE last_error IS NOT NULL`
				)
			).rows;
		},
		(rows) => rows.length > 0,
		20_000
	);
	expect(idleInTransaction).toBe(0);
	// It gave up on its own timeout (nodemailer's greeting timeout) and hung up.
	expect(failed.length).toBeGreaterThan(0);
	expect(failed[0].last_error).toMatch(/greeting|timeout/i);
	await until(
		async () => closedByClient,
		(n) => n > 0,
		5_000
	);
	expect(closedByClient).toBeGreaterThan(0);

	// The mail server comes back on the same port: every message goes out on a retry.
	await closeStalled();
	const mailbox = path.join(work, 'stall-mail');
	const mail: FakeMail = await startFakeMail({ port: smtpPort, dir: mailbox });
	closers.push(() => mail.close());
	const delivered = await until(
		async () =>
			readdirSync(mailbox)
				.filter((name) => name.endsWith('.json'))
				.flatMap((name) => JSON.parse(readFileSync(path.join(mailbox, name), 'utf8')).to),
		(to) => recipients.every((address) => to.includes(address)),
		40_000
	);
	expect(delivered.sort()).toEqual(recipients);
	const unsent = await until(
		async () => (await db.query(`SELECT id FROM outbox WHERE sent_at IS NULL`)).rows.length,
		(n) => n === 0,
		5_000
	);
	expect(unsent).toBe(0);
}, 90_000);

test('a sender killed after the mail server took the message resends it, after its claim runs out, with the same Message-ID', async () => {
	const smtpPort = await freePort();
	const received: { messageId: string; header: string; to: string[] }[] = [];
	let sender: ChildProcess | null = null;
	const capture = new SMTPServer({
		authOptional: true,
		disabledCommands: ['STARTTLS'],
		logger: false,
		onData(stream, session, callback) {
			const chunks: Buffer[] = [];
			stream.on('data', (chunk: Buffer) => chunks.push(chunk));
			stream.on('end', async () => {
				const raw = Buffer.concat(chunks);
				const parsed = await PostalMime.parse(raw);
				received.push({
					messageId: parsed.messageId ?? '',
					header: /^Message-ID:\s*(.*)$/im.exec(raw.toString('utf8'))?.[1]?.trim() ?? '',
					to: session.envelope.rcptTo.map((r) => r.address)
				});
				// The message is in the mail server's hands. The sender dies before the server's
				// acceptance can reach it, so its database never learns the message went out.
				if (received.length === 1) sender?.kill('SIGKILL');
				callback();
			});
		}
	});
	await new Promise<void>((resolve) => capture.listen(smtpPort, '127.0.0.1', resolve));
	closers.push(() => new Promise<void>((resolve) => capture.close(() => resolve())));

	const {
		rows: [row]
	} = await db.query(
		`INSERT INTO outbox (to_address, subject, body_text) VALUES ('crash@example.test', 'Picture lock', 'Locked at 14:00.') RETURNING id`
	);
	const env = { SMTP_TIMEOUT_MS: '500' };
	const exited = new Promise<NodeJS.Signals | null>((resolve) =>
		startWrenchroll(smtpPort, env, (server) => {
			sender = server;
			server.once('exit', (_code, signal) => resolve(signal));
		}).catch(() => undefined)
	);
	expect(await exited).toBe('SIGKILL');
	expect(received).toHaveLength(1);
	const afterCrash = (
		await db.query(`SELECT sent_at, claimed_until > now() AS claimed FROM outbox WHERE id = $1`, [
			row.id
		])
	).rows[0];
	expect(afterCrash.sent_at).toBeNull();
	expect(afterCrash.claimed).toBe(true); // the dead sender's claim still holds the row for a while

	// Started again, the sender finds the row's claim run out and sends it again.
	sender = null;
	await startWrenchroll(smtpPort, env);
	await until(
		async () => received.length,
		(n) => n >= 2,
		30_000
	);
	expect(received).toHaveLength(2);
	// The sender marks the row sent only after the mail server's acceptance reaches it, which can
	// be a moment after the message arrived here: wait for it rather than read once.
	const sentAt = await until(
		async () =>
			(await db.query(`SELECT sent_at FROM outbox WHERE id = $1`, [row.id])).rows[0].sent_at,
		(value) => value !== null,
		5_000
	);
	expect(sentAt).not.toBeNull();

	// Same Message-ID both times, built from the outbox row id and the site's host
	// (RFC 5322 §3.6.4: msg-id = "<" id-left "@" id-right ">", both dot-atom-text here).
	expect(received[0].to).toEqual(['crash@example.test']);
	expect(received[1].messageId).toBe(received[0].messageId);
	expect(received[0].header).toBe(`<${row.id}@127.0.0.1>`);
	const atext = "[A-Za-z0-9!#$%&'*+/=?^_`{|}~-]+"; // RFC 5322 §3.2.3 atext
	const dotAtom = `${atext}(?:\\.${atext})*`;
	expect(received[0].header).toMatch(new RegExp(`^<${dotAtom}@${dotAtom}>$`));
}, 90_000);
