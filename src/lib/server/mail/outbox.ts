/**
 * Mail goes through the outbox table: a write queues a row in the same transaction as the change
 * that caused it, and the sender loop delivers it over SMTP with retries. When SMTP is down,
 * nothing is lost; the row waits and is tried again with a growing delay.
 */
import nodemailer, { type Transporter } from 'nodemailer';
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
	transporter ??= nodemailer.createTransport(env.SMTP_URL, loopback ? { ignoreTLS: true } : {});
	return transporter;
}

/** Delay before retry n: 5 s, 10 s, 20 s … capped at one hour. */
export function retryDelaySeconds(attempts: number): number {
	return Math.min(5 * 2 ** Math.max(0, attempts - 1), 3600);
}

/** Sends what is due; returns how many were sent. Rows are claimed with SKIP LOCKED so two servers never double-send. */
export async function deliverDueMail(limit = 20): Promise<number> {
	const smtp = transport();
	if (!smtp) return 0;
	let sent = 0;
	await db.transaction().execute(async (trx) => {
		const due = await trx
			.selectFrom('outbox')
			.selectAll()
			.where('sentAt', 'is', null)
			.where('attempts', '<', MAX_ATTEMPTS)
			.where('nextAttemptAt', '<=', sql<Date>`now()`)
			.orderBy('createdAt')
			.limit(limit)
			.forUpdate()
			.skipLocked()
			.execute();
		for (const message of due) {
			try {
				await smtp.sendMail({
					from: FROM(),
					to: message.toAddress,
					subject: message.subject,
					text: message.bodyText
				});
				await trx
					.updateTable('outbox')
					.set({ sentAt: new Date(), attempts: message.attempts + 1, lastError: null })
					.where('id', '=', message.id)
					.execute();
				sent++;
			} catch (failure) {
				const attempts = message.attempts + 1;
				await trx
					.updateTable('outbox')
					.set({
						attempts,
						lastError: failure instanceof Error ? failure.message : String(failure),
						nextAttemptAt: new Date(Date.now() + retryDelaySeconds(attempts) * 1000)
					})
					.where('id', '=', message.id)
					.execute();
			}
		}
	});
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
