/**
 * A bucket reached through the S3 API (AWS SDK for JavaScript v3), one of the stores of
 * object-store.ts. A module of its own so the SDK (about 24 MB resident) is imported only on a
 * server with object storage set up (`prepareObjectStorage`).
 */
import { createReadStream, createWriteStream } from 'node:fs';
import { mkdtemp, rm, stat, unlink } from 'node:fs/promises';
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
import type { z } from 'zod';
import {
	ignoreMissing,
	type bucketSettings,
	type LocalFile,
	type ObjectStore,
	type ServeAs
} from './object-store';

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
