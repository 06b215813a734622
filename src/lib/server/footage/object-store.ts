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
 * the bucket by `keepFinishedUpload`.
 */
import { createReadStream, createWriteStream } from 'node:fs';
import { mkdir, mkdtemp, readdir, rename, rm, stat, unlink } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import {
	DeleteObjectsCommand,
	GetObjectCommand,
	HeadObjectCommand,
	S3Client
} from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { env } from '$env/dynamic/private';
import { z } from 'zod';
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

const ignoreMissing = (failure: NodeJS.ErrnoException) => {
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

const bucketSettings = z.object({
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

/** How long a presigned download or playback address stays valid. */
export const SIGNED_URL_SECONDS = 3600;
const PART_BYTES = 16 * 1024 * 1024;

/** A bucket through the S3 API (AWS SDK for JavaScript v3). */
export class BucketStore implements ObjectStore {
	readonly kind = 'bucket' as const;
	readonly client: S3Client;
	readonly bucket: string;
	/** The origin presigned addresses point at: the endpoint's (path style) or bucket.endpoint's. */
	readonly origin: string;
	constructor(settings: z.infer<typeof bucketSettings>) {
		this.bucket = settings.S3_BUCKET;
		const endpoint = new URL(settings.S3_ENDPOINT);
		if (settings.S3_FORCE_PATH_STYLE !== 'true')
			endpoint.hostname = `${this.bucket}.${endpoint.hostname}`;
		this.origin = endpoint.origin;
		this.client = new S3Client({
			endpoint: settings.S3_ENDPOINT,
			region: settings.S3_REGION,
			forcePathStyle: settings.S3_FORCE_PATH_STYLE === 'true',
			credentials: {
				accessKeyId: settings.S3_ACCESS_KEY_ID,
				secretAccessKey: settings.S3_SECRET_ACCESS_KEY
			}
		});
	}
	private async scratch(key: string): Promise<LocalFile> {
		const folder = await mkdtemp(path.join(tmpdir(), 'wrenchroll-object-'));
		return {
			path: path.join(folder, path.basename(key)),
			release: () => rm(folder, { recursive: true, force: true })
		};
	}
	async localCopy(key: string): Promise<LocalFile> {
		const local = await this.scratch(key);
		try {
			const object = await this.client.send(
				new GetObjectCommand({ Bucket: this.bucket, Key: key })
			);
			await pipeline(object.Body as Readable, createWriteStream(local.path));
			return local;
		} catch (failure) {
			await local.release();
			throw failure;
		}
	}
	workFile(key: string): Promise<LocalFile> {
		return this.scratch(key);
	}
	async moveIn(key: string, localPath: string, type: string): Promise<number> {
		const { size } = await stat(localPath);
		// lib-storage sends one PutObject for a small file, a multipart upload for a large one.
		await new Upload({
			client: this.client,
			params: {
				Bucket: this.bucket,
				Key: key,
				Body: createReadStream(localPath),
				ContentType: type,
				ContentLength: size
			},
			partSize: PART_BYTES,
			queueSize: 2
		}).done();
		await unlink(localPath).catch(ignoreMissing);
		return size;
	}
	async size(key: string): Promise<number | null> {
		try {
			const head = await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }));
			return head.ContentLength ?? null;
		} catch (failure) {
			const status = (failure as { $metadata?: { httpStatusCode?: number } }).$metadata
				?.httpStatusCode;
			if (status === 404) return null;
			throw failure;
		}
	}
	async remove(keys: readonly string[]): Promise<void> {
		if (keys.length === 0) return;
		const answer = await this.client.send(
			new DeleteObjectsCommand({
				Bucket: this.bucket,
				Delete: { Objects: keys.map((Key) => ({ Key })), Quiet: true }
			})
		);
		if (answer.Errors?.length)
			throw new Error(`the bucket kept ${answer.Errors.map((error) => error.Key).join(', ')}`);
	}
	/** A short-lived GET address for the object; the browser sends its Range straight to the store. */
	signedUrl(key: string, serveAs: ServeAs): Promise<string> {
		return getSignedUrl(
			this.client,
			new GetObjectCommand({
				Bucket: this.bucket,
				Key: key,
				ResponseContentType: serveAs.type,
				ResponseContentDisposition: serveAs.disposition,
				ResponseCacheControl: serveAs.cacheControl
			}),
			{ expiresIn: SIGNED_URL_SECONDS }
		);
	}
}

const disk = new DiskStore();
let bucket: BucketStore | null = null;
let bucketFrom = '';

/** The bucket the settings name, or null when S3_ENDPOINT and S3_BUCKET are not both set. */
export function configuredBucket(): BucketStore | null {
	if (!env.S3_ENDPOINT && !env.S3_BUCKET) return null;
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
	if (!bucket || bucketFrom !== key) {
		bucket = new BucketStore(parsed.data);
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
