/**
 * The inside of the upload hashing thread (the main-thread side is `running-hash.ts`). It keeps
 * one SHA-256 per upload and feeds it the bytes the main thread has just written to disk (copied
 * into a ring of memory shared with this thread), so the
 * hash is taken in the same single pass as the bytes arrive without costing the main thread the
 * hashing itself. Messages arrive in the order they were posted, so each hash sees its upload's
 * bytes in file order. Like the script reader, this module exports its own address and serves
 * only when started by the pool with its role.
 */
import { createHash, type Hash } from 'node:crypto';
import { isMainThread, parentPort, workerData } from 'node:worker_threads';

/** Where this module's code is: the `.ts` source in tests and `vite dev`, a built chunk in production. */
export const hashWorkerUrl = import.meta.url;

/** Marks a worker started by the pool, so importing this module anywhere else serves nothing. */
export const HASH_WORKER_ROLE = 'wrenchroll-upload-hash';

export type HashJob =
	/**
	 * The upload's next `bytes` lie in the shared ring at `segments` (start, length, start, length …);
	 * `start` opens a fresh hash first.
	 */
	| { type: 'add'; upload: string; start: boolean; segments: number[]; bytes: number }
	/** The hex digest of everything added, answered as `digest`; the hash is forgotten. */
	| { type: 'digest'; upload: string; ask: number }
	/** Forget the upload's hash. */
	| { type: 'drop'; upload: string };

export type HashAnswer =
	/** Done with an `add`: its part of the ring is free again. */
	{ type: 'added'; bytes: number } | { type: 'digest'; ask: number; sha256: string | null };

if (!isMainThread && parentPort && workerData?.role === HASH_WORKER_ROLE) {
	const port = parentPort;
	const ring: Uint8Array = workerData.ring;
	const hashes = new Map<string, Hash>();
	port.on('message', (job: HashJob) => {
		if (job.type === 'add') {
			if (job.start) hashes.set(job.upload, createHash('sha256'));
			const hash = hashes.get(job.upload);
			for (let index = 0; index < job.segments.length; index += 2) {
				const from = job.segments[index];
				hash?.update(ring.subarray(from, from + job.segments[index + 1]));
			}
			port.postMessage({ type: 'added', bytes: job.bytes } satisfies HashAnswer);
		} else if (job.type === 'digest') {
			const hash = hashes.get(job.upload);
			hashes.delete(job.upload);
			port.postMessage({
				type: 'digest',
				ask: job.ask,
				sha256: hash ? hash.digest('hex') : null
			} satisfies HashAnswer);
		} else hashes.delete(job.upload);
	});
}
