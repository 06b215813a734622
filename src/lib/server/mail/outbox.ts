/**
 * Mail goes through the outbox table: a write queues a row in the same transaction as the change
 * that caused it, and the sender loop delivers it over SMTP with retries. When SMTP is down,
 * nothing is lost; the row waits and is tried again with a growing delay.
 *
 * The sender never talks to SMTP inside a transaction: it claims one row at a time (a short
 * statement with FOR UPDATE SKIP LOCKED that sets claimed_until and commits), then sends with
 * connection, greeting and socket timeouts, then marks the row sent or schedules its retry. A
 * sender that dies mid-send leaves a claim that runs out, and the row is sent again with the same
 * Message-ID, so the receiving side can recognise the resend as the same message.
 */
import nodemailer, { type Transporter } from 'nodemailer';
import SMTPTransport from 'nodemailer/lib/smtp-transport/index.js';
import { sql, type Kysely, type Transaction } from 'kysely';
import { env } from '$env/dynamic/private';
import { db } from '../db';
import type { Database } from '../db/types';

export interface MailDraft {
	to: string;
	subject: string;
	text: string;
	channelId?: string | null;
}

const FROM = () => env.MAIL_FROM ?? 'Wrenchroll <crew@wrenchroll.invalid>';
const MAX_ATTEMPTS = 12;

/** How long one step of an SMTP conversation may take (connect, greeting, each reply): SMTP_TIMEOUT_MS, default 10 s. */
export function smtpTimeoutMs(): number {
	const configured = Number(env.SMTP_TIMEOUT_MS ?? 10_000);
	return Number.isFinite(configured) && configured > 0 ? configured : 10_000;
}

/**
 * How long a claim on a row lasts: well past what one send may take (connection, greeting and the
 * exchange, each bounded by the timeout). A send that outlives it may be sent twice, under the same
 * Message-ID.
 */
const claimMilliseconds = () => 6 * smtpTimeoutMs();

/**
 * The Message-ID of an outbox row: the row id at the site's host (RFC 5322 §3.6.4 msg-id,
 * `<id-left@id-right>`), so every attempt at the same row carries the same id.
 */
export function messageIdFor(outboxId: string, origin = env.ORIGIN): string {
	let host = 'wrenchroll.invalid';
	try {
		if (origin) host = new URL(origin).hostname || host;
	} catch {
		// not a URL: keep the fallback
	}
	return `<${outboxId}@${host}>`;
}

/** Queues a message; call inside the transaction of the change that causes it. */
export async function queueMail(
	executor: Kysely<Database> | Transaction<Database>,
	draft: MailDraft
): Promise<void> {
	await executor
		.insertInto('outbox')
		.values({
			toAddress: draft.to,
			subject: draft.subject,
			bodyText: draft.text,
			channelId: draft.channelId ?? null
		})
		.execute();
	kickMailSender();
}

let transporter: Transporter | null = null;
function transport(): Transporter | null {
	if (!env.SMTP_URL) return null;
	// ignoreTLS only for a loopback fake (its bundled certificate has expired); a real relay keeps STARTTLS.
	const loopback = /^smtp:\/\/(127\.|localhost|\[::1\])/.test(env.SMTP_URL);
	const timeout = smtpTimeoutMs();
	// nodemailer's own defaults wait 2 minutes to connect, 30 s for the greeting and 10 minutes
	// on a silent socket: a mail server that accepts and never answers would stall every message.
	transporter ??= nodemailer.createTransport(
		new SMTPTransport({
			url: env.SMTP_URL,
			ignoreTLS: loopback,
			connectionTimeout: timeout,
			greetingTimeout: timeout,
			socketTimeout: timeout,
			dnsTimeout: timeout
		})
	);
	return transporter;
}

/** Delay before retry n: 5 s, 10 s, 20 s … capped at one hour. */
export function retryDelaySeconds(attempts: number): number {
	return Math.min(5 * 2 ** Math.max(0, attempts - 1), 3600);
}

/**
 * Claims the oldest due row that no live sender holds, in one statement that commits at once.
 * SKIP LOCKED lets two servers claim side by side without waiting on each other; the claim counts
 * as an attempt, so a message that crashes its sender every time still stops after MAX_ATTEMPTS.
 */
async function claimNextMessage() {
	return db
		.updateTable('outbox')
		.set((eb) => ({
			attempts: eb('attempts', '+', 1),
			claimedUntil: sql<Date>`now() + ${claimMilliseconds()}::float8 * interval '1 millisecond'`
		}))
		.where('id', '=', (eb) =>
			eb
				.selectFrom('outbox')
				.select('id')
				.where('sentAt', 'is', null)
				.where('attempts', '<', MAX_ATTEMPTS)
				.where('nextAttemptAt', '<=', sql<Date>`now()`)
				.where((w) =>
					w.or([w('claimedUntil', 'is', null), w('claimedUntil', '<=', sql<Date>`now()`)])
				)
				.orderBy('createdAt')
				.limit(1)
				.forUpdate()
				.skipLocked()
		)
		.returningAll()
		.executeTakeFirst();
}

/** Errors about one message (a refused recipient or body); any other error means the mail server itself is unwell. */
const MESSAGE_ERRORS = new Set(['EENVELOPE', 'EMESSAGE', 'ESTREAM']);

/** Sends what is due; returns how many were sent. */
export async function deliverDueMail(limit = 20): Promise<number> {
	const smtp = transport();
	if (!smtp) return 0;
	let sent = 0;
	for (let round = 0; round < limit; round++) {
		const message = await claimNextMessage();
		if (!message) break;
		try {
			await smtp.sendMail({
				from: FROM(),
				to: message.toAddress,
				subject: message.subject,
				text: message.bodyText,
				messageId: messageIdFor(message.id)
			});
		} catch (failure) {
			await db
				.updateTable('outbox')
				.set({
					lastError: failure instanceof Error ? failure.message : String(failure),
					claimedUntil: null,
					nextAttemptAt: sql<Date>`now() + ${retryDelaySeconds(message.attempts)}::float8 * interval '1 second'`
				})
				.where('id', '=', message.id)
				.where('sentAt', 'is', null)
				.execute();
			// The mail server is down or silent: the rest waits for the next round instead of
			// each waiting out the same timeout now.
			if (!MESSAGE_ERRORS.has((failure as { code?: string }).code ?? '')) break;
			continue;
		}
		await db
			.updateTable('outbox')
			.set({ sentAt: new Date(), claimedUntil: null, lastError: null })
			.where('id', '=', message.id)
			.execute();
		sent++;
	}
	return sent;
}

let timer: ReturnType<typeof setTimeout> | null = null;
let running = false;
let again = false;
let stopped = false;

async function tick() {
	if (stopped) return;
	if (running) {
		again = true;
		return;
	}
	running = true;
	try {
		await deliverDueMail();
	} catch (failure) {
		console.error('mail sender:', failure instanceof Error ? failure.message : failure);
	} finally {
		running = false;
	}
	if (again && !stopped) {
		again = false;
		void tick();
	}
}

/**
 * Stops the sender for shutdown and waits for a round in progress to finish, so the database pool
 * can close without a half-sent round. Mail still queued is sent by the next start.
 */
export async function stopMailSender(): Promise<void> {
	stopped = true;
	if (timer) clearTimeout(timer);
	timer = null;
	while (running) await new Promise((resolve) => setTimeout(resolve, 20));
}

/** Runs the sender every few seconds for the life of the server. */
export function startMailSender(intervalMs = Number(env.MAIL_INTERVAL_MS ?? 3000)): void {
	if (timer) return;
	stopped = false;
	const loop = async () => {
		await tick();
		if (stopped) return;
		timer = setTimeout(loop, intervalMs);
		timer.unref?.();
	};
	timer = setTimeout(loop, 200);
	timer.unref?.();
}

/** Sends soon after a queue, without waiting for the next interval (after the transaction commits). */
export function kickMailSender(): void {
	setTimeout(() => void tick(), 50).unref?.();
}
