/**
 * Where finished footage, cuts and what the media worker makes from them live: the server's upload
 * folder (the default) or a bucket reached through the S3 API, when S3_ENDPOINT, S3_BUCKET,
 * S3_REGION, S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY are set (S3_FORCE_PATH_STYLE=true for
 * stores addressed as endpoint/bucket/key rather than bucket.endpoint/key).
 *
 * Each footage row says where its bytes are (`footage.stored_in`), so clips recorded before the
 * bucket was set up keep being served from disk. Keys are the same in both places: the upload's
 * id for the file itself, `derived/<footage id>/<name>` for the proxy, poster, sprite and peaks.
 *
 * Partial tus uploads always stay on local disk (see tus-server.ts); a finished one is moved into
 * the bucket by `keepFinishedUpload`. The bucket's code (bucket-store.ts, with the S3 client) is
 * loaded at start-up only when object storage is set up (`prepareObjectStorage`).
 */
import { mkdir, readdir, rename, rm, stat, unlink } from 'node:fs/promises';
import path from 'node:path';
import { env } from '$env/dynamic/private';
import { z } from 'zod';
import type { BucketStore } from './bucket-store';
import { uploadDir } from './tus-server';

export type StoredIn = 'disk' | 'bucket';

/** A local file to read or write, and what to call when done with it. */
export interface LocalFile {
	path: string;
	release(): Promise<void>;
}

/** What a presigned answer tells the browser about the file. */
export interface ServeAs {
	type: string;
	disposition: string;
	cacheControl: string;
}

export interface ObjectStore {
	readonly kind: StoredIn;
	/** A local copy of the object to read (the file itself on disk, a temporary download from a bucket). */
	localCopy(key: string): Promise<LocalFile>;
	/** A local path to make a new object in, before `moveIn` (beside its final place on disk, else a temp folder). */
	workFile(key: string): Promise<LocalFile>;
	/** Puts a finished local file under `key`; the local file is gone afterwards. Answers its size. */
	moveIn(key: string, localPath: string, type: string): Promise<number>;
	/** The object's size, or null when it is not there. */
	size(key: string): Promise<number | null>;
	/** Removes objects; ones already gone are fine. */
	remove(keys: readonly string[]): Promise<void>;
}

export const ignoreMissing = (failure: NodeJS.ErrnoException) => {
	if (failure.code !== 'ENOENT') throw failure;
};

/** The upload folder: keys are paths under UPLOAD_DIR. */
class DiskStore implements ObjectStore {
	readonly kind = 'disk' as const;
	private file(key: string) {
		return path.join(uploadDir(), key);
	}
	async localCopy(key: string): Promise<LocalFile> {
		const file = this.file(key);
		if ((await this.size(key)) === null)
			throw new Error('the uploaded file is no longer on the server');
		return { path: file, release: async () => undefined };
	}
	async workFile(key: string): Promise<LocalFile> {
		const final = this.file(key);
		const folder = path.dirname(final);
		await mkdir(folder, { recursive: true });
		// A worker killed mid-job leaves its half-made file behind: this run starts afresh.
		const prefix = `${path.basename(final)}.part-`;
		for (const name of await readdir(folder))
			if (name.startsWith(prefix)) await rm(path.join(folder, name), { force: true });
		const partial = `${final}.part-${process.pid}`;
		return { path: partial, release: () => rm(partial, { force: true }) };
	}
	async moveIn(key: string, localPath: string): Promise<number> {
		const final = this.file(key);
		if (localPath !== final) await rename(localPath, final);
		return (await stat(final)).size;
	}
	async size(key: string): Promise<number | null> {
		return stat(this.file(key)).then(
			(info) => (info.isFile() ? info.size : null),
			() => null
		);
	}
	async remove(keys: readonly string[]): Promise<void> {
		for (const key of keys) await unlink(this.file(key)).catch(ignoreMissing);
	}
}

/** A setting that must be there, named in its message. */
const required = (name: string) =>
	z.string({ error: `${name} is required` }).min(1, `${name} is required`);

export const bucketSettings = z.object({
	S3_ENDPOINT: z.url({
		protocol: /^https?$/,
		error: 'S3_ENDPOINT must be the address of the store, such as https://s3.example.net'
	}),
	S3_BUCKET: required('S3_BUCKET'),
	S3_REGION: z.string().min(1).default('us-east-1'),
	S3_ACCESS_KEY_ID: required('S3_ACCESS_KEY_ID'),
	S3_SECRET_ACCESS_KEY: required('S3_SECRET_ACCESS_KEY'),
	S3_FORCE_PATH_STYLE: z
		.enum(['true', 'false'], { error: 'S3_FORCE_PATH_STYLE must be true or false' })
		.default('false')
});

const disk = new DiskStore();
let bucket: BucketStore | null = null;
let bucketFrom = '';
/** The S3 client's code, loaded only when object storage is set up (it costs about 24 MB). */
let bucketStore: typeof import('./bucket-store') | null = null;

const bucketWanted = () => Boolean(env.S3_ENDPOINT || env.S3_BUCKET);

/**
 * Loads the S3 client when object storage is set up, and checks its settings (a mistake stops the
 * start, naming the setting). Called once at start-up, before anything asks for a store.
 */
export async function prepareObjectStorage(): Promise<void> {
	if (!bucketWanted()) return;
	bucketStore ??= await import('./bucket-store');
	configuredBucket();
}

/** The bucket the settings name, or null when S3_ENDPOINT and S3_BUCKET are not both set. */
export function configuredBucket(): BucketStore | null {
	if (!bucketWanted()) return null;
	const parsed = bucketSettings.safeParse({
		S3_ENDPOINT: env.S3_ENDPOINT,
		S3_BUCKET: env.S3_BUCKET,
		S3_REGION: env.S3_REGION || undefined,
		S3_ACCESS_KEY_ID: env.S3_ACCESS_KEY_ID,
		S3_SECRET_ACCESS_KEY: env.S3_SECRET_ACCESS_KEY,
		S3_FORCE_PATH_STYLE: env.S3_FORCE_PATH_STYLE || undefined
	});
	if (!parsed.success)
		throw new Error(
			`Object storage settings: ${parsed.error.issues.map((issue) => issue.message).join('; ')}`
		);
	const key = JSON.stringify(parsed.data);
	if (!bucketStore) throw new Error('Object storage is set up but its client is not loaded yet.');
	if (!bucket || bucketFrom !== key) {
		bucket = new bucketStore.BucketStore(parsed.data);
		bucketFrom = key;
	}
	return bucket;
}

/** Where new finished uploads go. */
export function storeForNewFootage(): ObjectStore {
	return configuredBucket() ?? disk;
}

/** The store a footage row's bytes are in. */
export function storeOf(storedIn: StoredIn): ObjectStore {
	if (storedIn === 'disk') return disk;
	const configured = configuredBucket();
	if (!configured)
		throw new Error('this clip is in the bucket, but no object storage is set up on this server');
	return configured;
}

/** Keys of everything made from a clip (the media worker's outputs). */
export const derivedKey = (footageId: string, fileName: string) =>
	`derived/${footageId}/${fileName}`;

/**
 * A finished upload's file into the store for new footage: on disk it stays where tus wrote it;
 * with a bucket it is copied there, then the local file and tus's sidecar are removed. When the
 * copy fails the clip stays on disk (and is served from there), so nothing is lost.
 */
export async function keepFinishedUpload(uploadId: string, type: string): Promise<StoredIn> {
	const target = storeForNewFootage();
	if (target.kind === 'disk') return 'disk';
	const file = path.join(uploadDir(), uploadId);
	try {
		await target.moveIn(uploadId, file, type);
	} catch (failure) {
		console.error(
			`object storage: upload ${uploadId} stays on disk: ${(failure as Error).message}`
		);
		return 'disk';
	}
	await unlink(`${file}.json`).catch(ignoreMissing);
	return 'bucket';
}
