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

/** Bytes handed to the thread and not yet hashed before a write waits: bounds the memory held. */
const IN_FLIGHT_LIMIT = 16 * 1024 * 1024;
/** The size of the buffers that carry bytes to the thread (a batch is about the write's 1 MiB). */
const SLAB_BYTES = 2 * 1024 * 1024;
/** Buffers back from the thread kept for the next batches. */
const SPARES_KEPT = IN_FLIGHT_LIMIT / SLAB_BYTES + 2;
/** The thread ends after this long without uploads. */
const IDLE_MS = 30_000;

class UploadHashes {
	#worker: Promise<Worker> | null = null;
	/** The thread now serving (a retired one's late exit must not touch its successor's state). */
	#thread: Worker | null = null;
	#idle: ReturnType<typeof setTimeout> | null = null;
	#inFlight = 0;
	#spare: ArrayBuffer[] = [];
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
		this.#post({ type: 'add', upload, start: true, piece: null, bytes: 0 }, []);
		return true;
	}

	/** Bytes written at the end of what the upload's hash has seen; resolves when more may follow. */
	add(upload: string, chunks: readonly Buffer[]): Promise<void> {
		// The batch is copied into one buffer, which is moved to the thread and back for the next
		// batch: moving costs more than copying 64 KiB, and buffers that come back are no garbage
		// for either thread's collector to wait on.
		let bytes = 0;
		for (const chunk of chunks) bytes += chunk.byteLength;
		const index = this.#spare.findIndex((buffer) => buffer.byteLength >= bytes);
		const piece =
			index >= 0 ? this.#spare.splice(index, 1)[0] : new ArrayBuffer(Math.max(bytes, SLAB_BYTES));
		const into = new Uint8Array(piece);
		let at = 0;
		for (const chunk of chunks) {
			into.set(chunk, at);
			at += chunk.byteLength;
		}
		this.#offsets.set(upload, (this.#offsets.get(upload) ?? 0) + bytes);
		this.#inFlight += bytes;
		this.#post({ type: 'add', upload, start: false, piece, bytes }, [piece]);
		if (this.#inFlight < IN_FLIGHT_LIMIT) return Promise.resolve();
		return new Promise((resolve) => this.#waiting.push(resolve));
	}

	/** Forgets the upload's running hash. */
	drop(upload: string): void {
		if (this.#offsets.delete(upload)) this.#post({ type: 'drop', upload }, []);
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
		this.#post({ type: 'digest', upload, ask }, []);
		return answer;
	}

	#post(job: HashJob, transfer: ArrayBuffer[]): void {
		const worker = (this.#worker ??= this.#start());
		this.#keepAwake();
		void worker.then(
			(thread) => {
				try {
					thread.postMessage(job, transfer);
				} catch {
					// Memory that cannot be moved (shared, or not detachable) is copied instead.
					thread.postMessage(job);
				}
			},
			(failure) => {
				if (this.#worker !== worker) return;
				console.error('The upload hashing thread did not start:', failure);
				this.#lost();
			}
		);
	}

	async #start(): Promise<Worker> {
		const { hashWorkerUrl, HASH_WORKER_ROLE } = await import('./hash-worker');
		const options = { workerData: { role: HASH_WORKER_ROLE } };
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
			if (answer.piece && this.#spare.length < SPARES_KEPT) this.#spare.push(answer.piece);
			if (this.#inFlight < IN_FLIGHT_LIMIT)
				for (const resolve of this.#waiting.splice(0)) resolve();
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
		this.#spare = [];
		for (const resolve of this.#waiting.splice(0)) resolve();
		for (const resolve of this.#asks.values()) resolve(null);
		this.#asks.clear();
	}

	#keepAwake(): void {
		if (this.#idle) clearTimeout(this.#idle);
		this.#idle = setTimeout(() => {
			this.#idle = null;
			if (this.#inFlight > 0 || this.#asks.size > 0) return this.#keepAwake();
			const worker = this.#worker;
			this.#lost();
			void worker?.then((thread) => thread.terminate());
		}, IDLE_MS);
		this.#idle.unref();
	}
}

/** The process's running upload hashes. */
export const uploadHashes = new UploadHashes();
