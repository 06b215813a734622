/**
 * tus's per-upload lock across every app process that shares the database (@tus/utils' Locker):
 * two processes behind one address must never write the same upload at once, and an upload whose
 * process died must be free for the next one at once.
 *
 * How: a session-level PostgreSQL advisory lock per upload id, taken with `pg_try_advisory_lock`
 * on a connection of a small pool of our own and held, with that connection, for the lock's life.
 * A session-level lock belongs to its connection, so it could not live on the app's shared pool
 * (another query there would hold it too, and releasing the connection would keep it). When the
 * holding process dies, even by SIGKILL, its socket closes, PostgreSQL ends the session and the
 * lock is gone: the resume on another process finds it free. We poll `pg_try_advisory_lock`
 * rather than wait in `pg_advisory_lock`, because a waiting statement cannot be abandoned when the
 * request is aborted or the wait times out without cancelling it on the server.
 *
 * tus asks the current holder to let go when another request wants the lock (its `requestRelease`
 * callback: a PATCH stalled on a half-open connection must not keep the upload from its resume).
 * Across processes that request travels as a NOTIFY on one channel; every process LISTENs on one
 * connection of its own and calls the callback of the lock it holds for that id.
 */
import pg from 'pg';
import { ERRORS, type Lock, type Locker, type RequestRelease } from '@tus/utils';

/**
 * tus's own lock timeout answers 500; a busy upload is no server fault. 423 Locked is what
 * tus-js-client retries on (with 409), so a waiting client simply tries again.
 */
export const LOCK_BUSY = {
	status_code: 423,
	body: 'Another request is still writing this upload. Try again in a moment; nothing was lost.\n'
};
const LOCKS_UNREACHABLE = {
	status_code: 503,
	body: 'The upload could not be locked: the database is out of reach. Try again in a moment.\n'
};

/** The first of the two advisory-lock keys: ours for tus uploads (the second is the id's hash). */
const LOCK_SPACE = 0x7475_7301;
const RELEASE_CHANNEL = 'wrenchroll_tus_release';

export interface PostgresLockerOptions {
	connectionString: string;
	/** How long a request waits for the lock before tus answers it with its lock-timeout error. */
	acquireLockTimeoutMs?: number;
	/** How often a waiting request tries the lock again. */
	retryMs?: number;
	/** Locks one process can hold at once (one connection each). */
	maxLocks?: number;
}

export class PostgresLocker implements Locker {
	readonly timeoutMs: number;
	readonly retryMs: number;
	readonly pool: pg.Pool;
	/** The release callbacks of the locks this process holds, by upload id. */
	readonly held = new Map<string, RequestRelease>();
	private listener: Promise<pg.Client> | null = null;
	private closed = false;

	constructor(private readonly options: PostgresLockerOptions) {
		this.timeoutMs = options.acquireLockTimeoutMs ?? 30_000;
		this.retryMs = options.retryMs ?? 100;
		this.pool = new pg.Pool({
			connectionString: options.connectionString,
			max: options.maxLocks ?? 20,
			// Waiting for a free lock connection counts against the lock's own wait.
			connectionTimeoutMillis: this.timeoutMs,
			idleTimeoutMillis: 10_000
		});
		this.pool.on('error', (failure) => console.error('upload locks:', failure.message));
	}

	newLock(id: string): Lock {
		return new PostgresLock(id, this);
	}

	/** LISTENs for other processes' release requests; started with the first lock. */
	listen(): void {
		if (this.listener || this.closed) return;
		const client = new pg.Client({ connectionString: this.options.connectionString });
		const forget = () => {
			if (this.listener === started) this.listener = null;
		};
		client.on('error', (failure) => {
			console.error('upload lock listener:', failure.message);
			forget();
		});
		client.on('end', forget);
		client.on('notification', (message) => {
			const release = message.payload ? this.held.get(message.payload) : undefined;
			if (release) void Promise.resolve(release()).catch(() => undefined);
		});
		const started = client
			.connect()
			.then(() => client.query(`LISTEN ${RELEASE_CHANNEL}`))
			.then(() => client);
		started.catch(forget);
		this.listener = started;
	}

	/** Asks whichever process holds `id`'s lock (this one included) to let go. */
	async askRelease(client: pg.PoolClient, id: string): Promise<void> {
		await client.query('SELECT pg_notify($1, $2)', [RELEASE_CHANNEL, id]);
	}

	/** Closes the listener and the lock connections (shutdown); held locks go with them. */
	async close(): Promise<void> {
		this.closed = true;
		const listener = this.listener;
		this.listener = null;
		await listener?.then((client) => client.end()).catch(() => undefined);
		await this.pool.end().catch(() => undefined);
	}
}

const quietly = (failure: Error) => console.error('upload lock connection lost:', failure.message);

class PostgresLock implements Lock {
	private client: pg.PoolClient | null = null;
	private release: RequestRelease | null = null;

	constructor(
		private readonly id: string,
		private readonly locker: PostgresLocker
	) {}

	async lock(stopSignal: AbortSignal, requestRelease: RequestRelease): Promise<void> {
		const { locker, id } = this;
		locker.listen();
		const deadline = Date.now() + locker.timeoutMs;
		let client: pg.PoolClient;
		try {
			client = await locker.pool.connect();
		} catch {
			throw LOCKS_UNREACHABLE;
		}
		// pg-pool stops listening for a checked-out client's errors: a session ended under a held
		// lock (a database restart) must not become an uncaught error. The lock went with it;
		// unlock() then finds the connection broken and drops it.
		client.on('error', quietly);
		let asked = 0;
		try {
			for (;;) {
				if (stopSignal.aborted) throw ERRORS.ABORTED;
				const { rows } = await client.query<{ taken: boolean }>(
					'SELECT pg_try_advisory_lock($1, hashtext($2)) AS taken',
					[LOCK_SPACE, id]
				);
				if (rows[0].taken) break;
				if (Date.now() >= deadline) throw LOCK_BUSY;
				// Ask the holder to let go now and then again each second while we wait.
				if (Date.now() - asked >= 1000) {
					asked = Date.now();
					await locker.askRelease(client, id);
				}
				await new Promise((resolve) => setTimeout(resolve, locker.retryMs));
			}
		} catch (failure) {
			const broken = !(failure === ERRORS.ABORTED || failure === LOCK_BUSY);
			client.off('error', quietly);
			client.release(broken);
			throw broken ? LOCKS_UNREACHABLE : failure;
		}
		this.client = client;
		this.release = requestRelease;
		locker.held.set(id, requestRelease);
	}

	async unlock(): Promise<void> {
		const client = this.client;
		if (!client) throw new Error('Releasing an unlocked lock!');
		this.client = null;
		// Only our own entry: after a lost session another request may already hold this id.
		if (this.locker.held.get(this.id) === this.release) this.locker.held.delete(this.id);
		this.release = null;
		try {
			await client.query('SELECT pg_advisory_unlock($1, hashtext($2))', [LOCK_SPACE, this.id]);
			client.off('error', quietly);
			client.release();
		} catch {
			// The connection is in doubt: close it, which ends the session and its locks.
			client.off('error', quietly);
			client.release(true);
		}
	}
}
