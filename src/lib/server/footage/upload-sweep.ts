/**
 * Removes unfinished uploads past their expiry (tus 1.0.0 Expiration: the server sends
 * Upload-Expires and may then remove the upload): the file, its tus sidecar and its upload row.
 * The database decides what is unfinished. @tus/file-store's own deleteExpired is not used: it
 * compares the sidecar's offset, which stays 0 (the real offset is the file's size), so it would
 * also remove finished footage.
 */
import { unlink } from 'node:fs/promises';
import path from 'node:path';
import { sql } from 'kysely';
import { db } from '../db';
import { uploadExpiryMs } from './upload-limits';
import { sweepTools } from './tus-server';

const ignoreMissing = (failure: NodeJS.ErrnoException) => {
	if (failure.code !== 'ENOENT') throw failure;
};

/** Removes expired unfinished uploads; returns how many. */
export async function sweepExpiredUploads(): Promise<number> {
	const { directory, store, locker } = sweepTools();
	const expired = await db
		.selectFrom('upload')
		.select('id')
		.where('completedAt', 'is', null)
		.where(
			'createdAt',
			'<',
			sql<Date>`now() - ${uploadExpiryMs()}::float8 * interval '1 millisecond'`
		)
		.orderBy('createdAt')
		.limit(100)
		.execute();
	let removed = 0;
	for (const { id } of expired) {
		// tus's own lock on the upload: a PATCH still writing to it is asked to stop first.
		const lock = locker.newLock(id);
		try {
			await lock.lock(new AbortController().signal, () => undefined);
		} catch {
			continue; // busy past the lock timeout: the next sweep tries again
		}
		try {
			// Every byte arrived and the footage row is being written: leave it to finish.
			const stored = await store.getUpload(id).catch(() => null);
			if (stored && stored.size !== undefined && stored.offset === stored.size) continue;
			const deleted = await db
				.deleteFrom('upload')
				.where('id', '=', id)
				.where('completedAt', 'is', null)
				.executeTakeFirst();
			if (Number(deleted.numDeletedRows) === 0) continue;
			const file = path.join(directory, id);
			await unlink(file).catch(ignoreMissing);
			await unlink(`${file}.json`).catch(ignoreMissing);
			removed++;
		} finally {
			await lock.unlock();
		}
	}
	return removed;
}

let timer: ReturnType<typeof setTimeout> | null = null;
let sweeping: Promise<unknown> | null = null;
let stopped = false;

/** Sweeps every quarter of the expiry period (between 1 s and 1 h) for the life of the server. */
export function startUploadSweep(): void {
	if (timer) return;
	stopped = false;
	const interval = Math.min(3_600_000, Math.max(1_000, uploadExpiryMs() / 4));
	const loop = async () => {
		sweeping = sweepExpiredUploads().catch((failure) =>
			console.error('upload sweep:', failure instanceof Error ? failure.message : failure)
		);
		await sweeping;
		sweeping = null;
		if (stopped) return;
		timer = setTimeout(loop, interval);
		timer.unref?.();
	};
	timer = setTimeout(loop, Math.min(interval, 10_000));
	timer.unref?.();
}

/** Stops the sweep for shutdown and waits for a sweep in progress. */
export async function stopUploadSweep(): Promise<void> {
	stopped = true;
	if (timer) clearTimeout(timer);
	timer = null;
	await sweeping;
}
