/**
 * SHA-256 of each upload computed while its bytes arrive, so completion needs no second pass over
 * a large file, and computed in a worker thread (hash-worker.ts), so the main thread, which
 * receives and writes every byte, does not also spend about a second per GiB hashing them. The
 * upload store hands over each batch of bytes once it is on disk.
 *
 * A running hash is trusted only while every write continues exactly where the last one ended;
 * after a resume from another offset (an aborted request, a restarted server, another process), a
 * failed write or a lost thread it is dropped and the file is hashed from disk on completion. The
 * thread is started on the first upload and ended after a while without any (its hashes of
 * unfinished uploads are then dropped the same way).
 */
import { Worker } from 'node:worker_threads';
import type { HashAnswer, HashJob } from './hash-worker';

/**
 * The bytes travel through one ring of shared memory: the main thread copies each written batch in
 * and posts where it lies; the thread hashes it there and says so, which frees that part of the
 * ring. Moving buffers between threads instead cost more than the copy and left the collector
 * of both threads chasing their memory. The ring's size bounds what waits to be hashed.
 */
const RING_BYTES = 8 * 1024 * 1024;
/** The thread ends after this long without uploads. */
const IDLE_MS = 30_000;

class UploadHashes {
	#worker: Promise<Worker> | null = null;
	/** The thread now serving (a retired one's late exit must not touch its successor's state). */
	#thread: Worker | null = null;
	/** Counts threads started, so a write that waited can tell its thread was replaced meanwhile. */
	#generation = 0;
	#ring: Uint8Array<ArrayBufferLike> = new Uint8Array(0);
	/** Where the next bytes go in the ring, and how many before it wait to be hashed. */
	#head = 0;
	#inFlight = 0;
	#idle: ReturnType<typeof setTimeout> | null = null;
	#lastUsed = 0;
	#waiting: (() => void)[] = [];
	#asks = new Map<number, (sha256: string | null) => void>();
	#nextAsk = 1;
	/** Uploads with a running hash, and how many of their bytes it has been given. */
	#offsets = new Map<string, number>();

	/**
	 * Before a write at `offset`: true when its bytes are to be hashed (a fresh upload, or one whose
	 * hash has seen exactly the bytes before `offset`).
	 */
	begin(upload: string, offset: number): boolean {
		if (offset !== 0 && this.#offsets.get(upload) === offset) return true;
		this.drop(upload);
		if (offset !== 0) return false;
		this.#offsets.set(upload, 0);
		this.#post({ type: 'add', upload, start: true, segments: [], bytes: 0 });
		return true;
	}

	/** Bytes written at the end of what the upload's hash has seen; resolves when more may follow. */
	async add(upload: string, chunks: readonly Buffer[]): Promise<void> {
		if (!this.#offsets.has(upload)) return;
		const generation = this.#generation;
		let segments: number[] = [];
		let bytes = 0;
		const send = () => {
			if (bytes === 0) return;
			// A hash dropped meanwhile stays dropped; the thread still frees the ring's part.
			const seen = this.#offsets.get(upload);
			if (seen !== undefined) this.#offsets.set(upload, seen + bytes);
			this.#post({ type: 'add', upload, start: false, segments, bytes });
			segments = [];
			bytes = 0;
		};
		for (const chunk of chunks) {
			for (let at = 0; at < chunk.byteLength;) {
				const room = Math.min(RING_BYTES - this.#inFlight, RING_BYTES - this.#head);
				if (room === 0) {
					send();
					await new Promise<void>((resolve) => this.#waiting.push(resolve));
					// The thread was lost meanwhile: so was this upload's hash.
					if (generation !== this.#generation || !this.#offsets.has(upload)) return;
					continue;
				}
				const length = Math.min(room, chunk.byteLength - at);
				this.#ring.set(chunk.subarray(at, at + length), this.#head);
				segments.push(this.#head, length);
				this.#head = (this.#head + length) % RING_BYTES;
				this.#inFlight += length;
				bytes += length;
				at += length;
			}
		}
		send();
	}

	/** Forgets the upload's running hash. */
	drop(upload: string): void {
		if (this.#offsets.delete(upload)) this.#post({ type: 'drop', upload });
	}

	/** How many bytes the upload's running hash has seen, or undefined when it has none. */
	seen(upload: string): number | undefined {
		return this.#offsets.get(upload);
	}

	/** The SHA-256 of a finished upload of `size` bytes if its running hash saw all of them, else null. */
	async digest(upload: string, size: number): Promise<string | null> {
		if (this.#offsets.get(upload) !== size) {
			this.drop(upload);
			return null;
		}
		this.#offsets.delete(upload);
		const ask = this.#nextAsk++;
		const answer = new Promise<string | null>((resolve) => this.#asks.set(ask, resolve));
		this.#post({ type: 'digest', upload, ask });
		return answer;
	}

	#post(job: HashJob): void {
		if (!this.#worker) {
			this.#generation += 1;
			this.#ring = new Uint8Array(new SharedArrayBuffer(RING_BYTES));
			this.#head = 0;
			this.#inFlight = 0;
			this.#worker = this.#start(this.#ring);
		}
		const worker = this.#worker;
		this.#keepAwake();
		void worker.then(
			(thread) => thread.postMessage(job),
			(failure) => {
				if (this.#worker !== worker) return;
				console.error('The upload hashing thread did not start:', failure);
				this.#lost();
			}
		);
	}

	async #start(ring: Uint8Array<ArrayBufferLike>): Promise<Worker> {
		const { hashWorkerUrl, HASH_WORKER_ROLE } = await import('./hash-worker');
		const options = { workerData: { role: HASH_WORKER_ROLE, ring } };
		const thread = hashWorkerUrl.endsWith('.ts')
			? // The source (tests, `vite dev`) is TypeScript: register tsx's loader in the thread first.
				new Worker(
					`import('tsx/esm/api').then(({ register }) => { register(); return import(${JSON.stringify(hashWorkerUrl)}); });`,
					{ ...options, eval: true }
				)
			: new Worker(new URL(hashWorkerUrl), options);
		this.#thread = thread;
		const lost = () => {
			if (this.#thread === thread) this.#lost();
		};
		thread.on('message', (answer: HashAnswer) => this.#thread === thread && this.#heard(answer));
		thread.on('error', (failure) => {
			console.error('The upload hashing thread stopped:', failure);
			lost();
		});
		thread.on('exit', lost);
		// Never keeps the process alive by itself: a request waiting on it does.
		thread.unref();
		return thread;
	}

	#heard(answer: HashAnswer): void {
		if (answer.type === 'added') {
			this.#inFlight -= answer.bytes;
			if (answer.bytes > 0) for (const resolve of this.#waiting.splice(0)) resolve();
			return;
		}
		this.#asks.get(answer.ask)?.(answer.sha256);
		this.#asks.delete(answer.ask);
	}

	/** The thread is gone: every running hash with it; whoever waits goes on without. */
	#lost(): void {
		this.#worker = null;
		this.#thread = null;
		this.#offsets.clear();
		this.#inFlight = 0;
		this.#head = 0;
		for (const resolve of this.#waiting.splice(0)) resolve();
		for (const resolve of this.#asks.values()) resolve(null);
		this.#asks.clear();
	}

	/** Ends the thread once IDLE_MS have passed since it was last used (one timer, not one per batch). */
	#keepAwake(): void {
		this.#lastUsed = Date.now();
		if (this.#idle) return;
		const check = () => {
			const idleFor = Date.now() - this.#lastUsed;
			if (idleFor < IDLE_MS || this.#inFlight > 0 || this.#asks.size > 0) {
				this.#idle = setTimeout(check, Math.max(IDLE_MS - idleFor, 1000));
				this.#idle.unref();
				return;
			}
			this.#idle = null;
			const worker = this.#worker;
			this.#lost();
			void worker?.then((thread) => thread.terminate());
		};
		this.#idle = setTimeout(check, IDLE_MS);
		this.#idle.unref();
	}
}

/** The process's running upload hashes. */
export const uploadHashes = new UploadHashes();
