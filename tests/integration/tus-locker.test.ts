/**
 * The upload locks hold across processes: two PostgresLockers with pools of their own stand for two
 * app processes on one database. @tus/utils' Lock contract (its Locker.d.ts): `lock(signal,
 * requestRelease)` waits until the resource is free and calls the holder's `requestRelease` so it
 * lets go; `unlock()` frees it. The in-memory locker @tus/server ships keeps its locks in one
 * process's Map, so two of them never exclude each other; these checks are what it could not do.
 */
import { afterAll, expect, inject, test } from 'vitest';
import pg from 'pg';
import { ERRORS } from '@tus/utils';
import { LOCK_BUSY, PostgresLocker } from '../../src/lib/server/footage/tus-locker';

const lockers: PostgresLocker[] = [];
function processLocker(timeoutMs = 10_000): PostgresLocker {
	const locker = new PostgresLocker({
		connectionString: inject('databaseUrl'),
		acquireLockTimeoutMs: timeoutMs,
		retryMs: 20
	});
	lockers.push(locker);
	return locker;
}

afterAll(async () => {
	await Promise.all(lockers.map((locker) => locker.close()));
});

const id = (n: number) => `${'ab'.repeat(15)}${String(n).padStart(2, '0')}`;
const never = () => new AbortController().signal;

test('a lock held by one process keeps another waiting, asks the holder to let go, then passes', async () => {
	const [first, second] = [processLocker(), processLocker()];
	const held = first.newLock(id(1));
	let released = 0;
	const order: string[] = [];
	await held.lock(never(), () => {
		released++;
		// The holder finishes its write, then lets go (tus's PATCH does this on context.cancel()).
		setTimeout(() => {
			order.push('first unlocks');
			void held.unlock();
		}, 200);
	});
	const waiting = second.newLock(id(1));
	await waiting.lock(never(), () => undefined);
	order.push('second holds');
	expect(released).toBe(1);
	expect(order).toEqual(['first unlocks', 'second holds']);
	await waiting.unlock();
});

test('a holder that does not let go: the waiter gives up after its timeout with 423, not 500', async () => {
	const [first, second] = [processLocker(), processLocker(400)];
	const held = first.newLock(id(2));
	await held.lock(never(), () => undefined);
	const started = Date.now();
	await expect(second.newLock(id(2)).lock(never(), () => undefined)).rejects.toBe(LOCK_BUSY);
	expect(Date.now() - started).toBeGreaterThanOrEqual(400);
	expect(LOCK_BUSY.status_code).toBe(423);
	await held.unlock();
	// Free again: the waiter's process takes it at once.
	const after = second.newLock(id(2));
	await after.lock(never(), () => undefined);
	await after.unlock();
});

test('a request that ends while waiting stops waiting', async () => {
	const [first, second] = [processLocker(), processLocker()];
	const held = first.newLock(id(3));
	await held.lock(never(), () => undefined);
	const request = new AbortController();
	const waiting = second.newLock(id(3)).lock(request.signal, () => undefined);
	setTimeout(() => request.abort(), 100);
	await expect(waiting).rejects.toBe(ERRORS.ABORTED);
	await held.unlock();
});

test('when the holding session dies (its process killed), the lock is free at once', async () => {
	const [first, second] = [processLocker(), processLocker(5_000)];
	const held = first.newLock(id(4));
	await held.lock(never(), () => undefined);
	// End the holder's database session as a killed process's closed socket does.
	const admin = new pg.Client({ connectionString: inject('databaseUrl') });
	await admin.connect();
	try {
		const ended = await admin.query(
			`SELECT pg_terminate_backend(pid) AS ended FROM pg_locks
			 WHERE locktype = 'advisory' AND granted AND objid = hashtext($1)::oid`,
			[id(4)]
		);
		expect(ended.rows).toEqual([{ ended: true }]);
	} finally {
		await admin.end();
	}
	const started = Date.now();
	const next = second.newLock(id(4));
	await next.lock(never(), () => undefined);
	expect(Date.now() - started).toBeLessThan(5_000);
	await next.unlock();
	// The dead holder's unlock does not throw: its connection is dropped instead.
	await held.unlock();
});

test('locks on different uploads do not wait on each other', async () => {
	const [first, second] = [processLocker(), processLocker(300)];
	const a = first.newLock(id(5));
	const b = second.newLock(id(6));
	await a.lock(never(), () => undefined);
	await b.lock(never(), () => undefined);
	await Promise.all([a.unlock(), b.unlock()]);
});

test("a dead holder's late unlock does not drop the next holder's release callback", async () => {
	const [first, second] = [processLocker(), processLocker(3_000)];
	const dead = first.newLock(id(7));
	await dead.lock(never(), () => undefined);
	const admin = new pg.Client({ connectionString: inject('databaseUrl') });
	await admin.connect();
	try {
		await admin.query(
			`SELECT pg_terminate_backend(pid) FROM pg_locks
			 WHERE locktype = 'advisory' AND granted AND objid = hashtext($1)::oid`,
			[id(7)]
		);
	} finally {
		await admin.end();
	}
	// The same process takes the upload again, then the dead request finally lets go.
	const next = first.newLock(id(7));
	let asked = 0;
	await next.lock(never(), () => {
		asked++;
		void next.unlock();
	});
	await dead.unlock();
	// Another process still reaches the new holder with its release request.
	const other = second.newLock(id(7));
	await other.lock(never(), () => undefined);
	expect(asked).toBe(1);
	await other.unlock();
});
