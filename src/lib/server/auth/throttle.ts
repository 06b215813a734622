/**
 * Fixed-window attempt counters in PostgreSQL, taken before the work they guard. One upsert counts
 * an attempt against every key it names and returns the new counts: the row lock of
 * INSERT … ON CONFLICT DO UPDATE orders concurrent attempts, so of forty at once exactly the first
 * `limit` see a count within the limit. An attempt refused on any key gives its counts back, so a
 * refusal never uses up another key's budget; a caller gives them back too when the attempt turns
 * out not to count (a successful sign-in). Keys are SHA-256 hashes: no address is stored.
 */
import { createHash } from 'node:crypto';
import { sql } from 'kysely';
import { db } from '../db';
import { THROTTLE_LIMITS, type Limit } from './throttle-limits';
import { clientKey } from './client-address';

export interface Counter<Kind extends string = string> {
	/** Which limit refused, for the message: e.g. the address or the client. */
	kind: Kind;
	/** What is counted, unique across every counter: e.g. "sign-in address " plus the address. Stored hashed. */
	key: string;
	limit: Limit;
}

export type Taken<Kind extends string> =
	| { ok: true }
	/** `kind` of the counter that refused; `retryAfter` whole seconds until every full window ends. */
	| { ok: false; kind: Kind; retryAfter: number };

const stored = (counter: Counter) => createHash('sha256').update(counter.key).digest('hex');

let lastSweep = 0;
/** Drops counters of long-gone windows, at most every ten minutes. */
async function sweep() {
	if (Date.now() - lastSweep < 10 * 60 * 1000) return;
	lastSweep = Date.now();
	await db
		.deleteFrom('throttleCounter')
		.where('windowEndsAt', '<', sql<Date>`now() - interval '1 hour'`)
		.execute();
}

/** Counts one attempt against every counter at once; refuses (and gives back) when any is past its limit. */
export async function takeAttempt<Kind extends string>(
	counters: Counter<Kind>[]
): Promise<Taken<Kind>> {
	await sweep();
	// Always lock rows in one order, so two attempts sharing keys can never deadlock.
	const rows = counters
		.map((counter) => ({ counter, key: stored(counter) }))
		.sort((a, b) => (a.key < b.key ? -1 : 1));
	const keys = rows.map((row) => row.key);
	const windows = rows.map((row) => row.counter.limit.windowSeconds);
	const { rows: counts } = await sql<{ key: string; hits: number; secondsLeft: number }>`
		INSERT INTO throttle_counter AS t (key, hits, window_ends_at)
		SELECT k.key, 1, now() + make_interval(secs => k.seconds)
		FROM unnest(${keys}::text[], ${windows}::int[]) WITH ORDINALITY AS k(key, seconds, n)
		ORDER BY k.n
		ON CONFLICT (key) DO UPDATE SET
			hits = CASE WHEN t.window_ends_at <= now() THEN 1 ELSE t.hits + 1 END,
			window_ends_at = CASE WHEN t.window_ends_at <= now() THEN excluded.window_ends_at
				ELSE t.window_ends_at END
		RETURNING key, hits, ceil(extract(epoch FROM window_ends_at - now()))::int AS seconds_left
	`.execute(db);
	const over = counts
		.map((count) => ({ count, row: rows.find((row) => row.key === count.key)! }))
		.filter(({ count, row }) => count.hits > row.counter.limit.limit);
	if (over.length === 0) return { ok: true };
	await giveBack(counters);
	const worst = over.reduce((a, b) => (b.count.secondsLeft > a.count.secondsLeft ? b : a));
	return {
		ok: false,
		kind: worst.row.counter.kind,
		retryAfter: Math.max(1, ...over.map(({ count }) => count.secondsLeft))
	};
}

/** Takes back one attempt from each counter (one that was refused, or did not count after all). */
export async function giveBack(counters: Counter[]): Promise<void> {
	// One row per statement: a multi-row UPDATE locks in scan order and could deadlock with takeAttempt.
	for (const key of counters.map(stored).sort()) {
		await db
			.updateTable('throttleCounter')
			.set({ hits: sql<number>`greatest(hits - 1, 0)` })
			.where('key', '=', key)
			.where('windowEndsAt', '>', sql<Date>`now()`)
			.execute();
	}
}

/** Forgets a counter altogether (its owner proved who they are another way). */
export async function clearCounter(counter: Counter): Promise<void> {
	await db.deleteFrom('throttleCounter').where('key', '=', stored(counter)).execute();
}

/** Reset and unlock mails: per address asked for (known or not) and per client asking. */
export function mailCounters(
	email: string,
	clientAddress: string
): Counter<'address' | 'client'>[] {
	return [
		{
			kind: 'address',
			key: `mail address ${email.trim().toLowerCase()}`,
			limit: THROTTLE_LIMITS.mailAddress
		},
		{
			kind: 'client',
			key: `mail client ${clientKey(clientAddress)}`,
			limit: THROTTLE_LIMITS.mailClient
		}
	];
}
