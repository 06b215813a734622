/**
 * Where a tus PATCH's bytes go, with as little between the socket and the disk as possible.
 *
 * - `HashingFileStore` is @tus/file-store's `FileStore` (file layout, metadata, offsets from the
 *   file's size) whose `write` sends the bytes through one writable straight to the file (each
 *   batch one positioned `writev`) and, while the disk takes them, to the upload's running
 *   SHA-256 (running-hash.ts), instead of FileStore's write stream behind a counting transform and
 *   our hashing transform.
 * - `takeNodeBodies` lets tus's PATCH handler take a Node.js request body as it is. @tus/server
 *   reads a PATCH body as a Web stream and turns it back into a Node.js stream; on the Node.js
 *   path (server.js → node-uploads.ts) the request's own stream is handed in, which skips both
 *   conversions (a promise per chunk each). Everything else about the PATCH (offsets, locks,
 *   expiry, Upload-Length, completion) stays tus's own.
 */
import fs from 'node:fs';
import { promisify } from 'node:util';
import path from 'node:path';
import { PassThrough, Readable, Writable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { FileStore } from '@tus/file-store';
import { ERRORS, StreamLimiter, type CancellationContext, type Upload } from '@tus/utils';
import type { Server } from '@tus/server';
import { uploadHashes } from './running-hash';

/** How much a write gathers before it waits for the disk: one `writev` takes what has gathered. */
const WRITE_HIGH_WATER = 1024 * 1024;

/**
 * Every socket read of a request body is a fresh 64 KiB buffer, freed only when V8 collects its
 * small JavaScript wrapper. Left to itself V8 lets those buffers pile up to about 64 MB outside
 * its heap and then runs a full collection (tens of milliseconds each, over the whole heap). A
 * young-generation collection after every COLLECT_EVERY_BYTES written frees them early and for
 * little: nearly everything young is garbage by then. Measured on a bare Node.js server streaming
 * 2 GiB to disk: peak resident 84 → 62 MB, and less CPU (4.9 → 4.3 s).
 *
 * These collections were taken out once (they seemed to set off runs of full collections in later
 * uploads) and brought back after the server got `--initial-old-space-size=128`
 * (scripts/lib/server-entry.ts), which was the cause of those runs. In the uploads bench of
 * 2026-12-04, same hour and machine: with them the app's peak was 141 and 148 MB and its CPU
 * 3.5–4.6 s per 2 GiB; without them 168 MB and 4.2–5.0 s (README, Benchmarks).
 */
const COLLECT_EVERY_BYTES = 8 * 1024 * 1024;
let writtenSinceCollection = 0;
let youngCollection: (() => void) | null | undefined;

/** V8's young-generation collection, or null where it cannot be had. */
function youngCollector(): (() => void) | null {
	if (youngCollection !== undefined) return youngCollection;
	try {
		// `gc` is given to contexts made after the flag is set; the app's own global stays as it was.
		setFlagsFromString('--expose-gc');
		const gc = runInNewContext('gc') as (options: { type: 'minor' }) => void;
		youngCollection = () => gc({ type: 'minor' });
	} catch {
		youngCollection = null;
	}
	return youngCollection;
}

/** Counts bytes written to disk and collects the young generation every COLLECT_EVERY_BYTES. */
function collectAfter(bytes: number): void {
	writtenSinceCollection += bytes;
	if (writtenSinceCollection < COLLECT_EVERY_BYTES) return;
	writtenSinceCollection = 0;
	const collect = youngCollector();
	// On the next turn, when the batch just written is no longer referenced from this call.
	if (collect) setImmediate(collect);
}

/** `fs.writev` as a promise (the callback form: FileHandle's writev costs several times more CPU here). */
const writev = (fd: number, chunks: Buffer[], position: number) =>
	new Promise<number>((resolve, reject) =>
		fs.writev(fd, chunks, position, (failure, written) =>
			failure ? reject(failure) : resolve(written)
		)
	);

/** Writes all of `chunks` at `position`, however many calls it takes. */
async function writeAll(fd: number, chunks: readonly Buffer[], position: number): Promise<number> {
	let rest = [...chunks];
	let written = 0;
	for (;;) {
		const bytesWritten = await writev(fd, rest, position + written);
		written += bytesWritten;
		let skip = bytesWritten;
		while (rest.length > 0 && skip >= rest[0].byteLength) skip -= rest.shift()!.byteLength;
		if (rest.length === 0) return written;
		if (bytesWritten === 0) throw new Error('the disk took no bytes');
		rest = [rest[0].subarray(skip), ...rest.slice(1)];
	}
}

export class HashingFileStore extends FileStore {
	override async write(readable: Readable, id: string, offset: number): Promise<number> {
		const hashing = uploadHashes.begin(id, offset);
		const fd = await promisify(fs.open)(path.join(this.directory, id), 'r+');
		let written = 0;
		/** The write under way: the file is closed only after it, even when the stream fails first. */
		let writing: Promise<unknown> = Promise.resolve();
		const sink = new Writable({
			highWaterMark: WRITE_HIGH_WATER,
			writev(entries, done) {
				const chunks = entries.map((entry) => entry.chunk as Buffer);
				writing = writeAll(fd, chunks, offset + written).then((bytes) => {
					written += bytes;
					collectAfter(bytes);
					done();
				}, done);
				// Hashed while the disk takes them (the write runs on libuv's thread pool). Should the
				// write fail, the whole request fails and its running hash is dropped below, so the
				// hash never stands for bytes the file lacks.
				if (hashing) uploadHashes.add(id, chunks);
			}
		});
		let failed = false;
		try {
			await pipeline(readable, sink);
		} catch {
			failed = true;
		}
		await writing.catch(() => undefined);
		await promisify(fs.close)(fd);
		if (failed) {
			// As FileStore: the offset is what the file holds; the next request starts from there.
			uploadHashes.drop(id);
			throw ERRORS.FILE_WRITE_ERROR;
		}
		if (hashing && uploadHashes.seen(id) !== offset + written) uploadHashes.drop(id);
		return offset + written;
	}
}

/** What `writeToStore` of tus's PATCH handler is given and does (BaseHandler in @tus/server). */
interface StoreWriter {
	store: FileStore;
	writeToStore(
		body: ReadableStream | Readable | null,
		upload: Upload,
		maxFileSize: number,
		context: CancellationContext
	): Promise<number>;
}

/**
 * Lets the tus server's PATCH handler take a request whose `body` is the Node.js request itself.
 * What it then does follows @tus/server's own `BaseHandler.writeToStore` (2.4) step for step,
 * without its Web-to-Node conversion: a pass-through between the request and the store, so a
 * failed write never destroys the request (the client still gets its answer), and so a lock
 * wanted by a newer request (tus's cancel) ends the write gracefully with what has arrived.
 */
export function takeNodeBodies(server: Server): void {
	const handler = server.handlers.PATCH as unknown as StoreWriter;
	const throughWeb = handler.writeToStore.bind(handler);
	handler.writeToStore = (body, upload, maxFileSize, context) =>
		body instanceof Readable
			? writeNodeBody(handler.store, body, upload, maxFileSize, context)
			: throughWeb(body, upload, maxFileSize, context);
}

async function writeNodeBody(
	store: FileStore,
	body: Readable,
	upload: Upload,
	maxFileSize: number,
	context: CancellationContext
): Promise<number> {
	if (context.signal.aborted) throw ERRORS.ABORTED;
	const proxy = new PassThrough({ highWaterMark: WRITE_HIGH_WATER });
	let sourceError: unknown = undefined;
	const onSourceError = (failure: unknown) => {
		sourceError = failure;
		body.unpipe(proxy);
		if (!context.signal.aborted) proxy.destroy(failure as Error);
	};
	body.on('error', onSourceError);
	// A request cut off without an error event must not leave the write waiting for more bytes.
	const onClose = () => {
		if (!body.readableEnded && sourceError === undefined) onSourceError(new Error('aborted'));
	};
	body.on('close', onClose);
	const onAbort = () => {
		body.unpipe(proxy);
		if (!proxy.destroyed) proxy.end();
	};
	context.signal.addEventListener('abort', onAbort, { once: true });
	try {
		// pipeline answers what its last step answers: the new offset.
		const offset: unknown = await pipeline(
			body.pipe(proxy),
			new StreamLimiter(maxFileSize),
			(stream: AsyncIterable<Buffer>) =>
				store.write(stream as unknown as Readable, upload.id, upload.offset)
		);
		return offset as number;
	} catch (failure) {
		body.unpipe(proxy);
		const aborted =
			(sourceError !== undefined && failure === sourceError) ||
			(failure instanceof Error && failure.name === 'AbortError');
		throw aborted ? ERRORS.ABORTED : failure;
	} finally {
		body.off('error', onSourceError);
		body.off('close', onClose);
		context.signal.removeEventListener('abort', onAbort);
	}
}
