/**
 * What an upload may take, checked when it is created (tus Creation), before any byte is stored:
 * the channel's storage quota, and a free-space floor on the upload disk. Both count the space
 * promised to unfinished uploads (their declared length), so uploads declared together cannot
 * promise more than there is. An upload of unknown length (tus Upload-Defer-Length) counts as the
 * largest upload allowed until it finishes and its real size is recorded.
 */
import { mkdir, stat, statfs } from 'node:fs/promises';
import path from 'node:path';
import { sql, type Insertable, type Kysely, type Transaction } from 'kysely';
import { env } from '$env/dynamic/private';
import { formatBytes } from '$lib/components/uploads/format';
import { db } from '../db';
import type { Database } from '../db/types';
import type { UploadTable } from '../db/tables/shoot';

/** The quota is set in decimal gigabytes, as disk makers count. */
export const GB = 1e9;
/** Share of the upload disk kept free when UPLOAD_FREE_FLOOR is not set. */
const DEFAULT_FLOOR_SHARE = 0.05;
const DEFAULT_EXPIRY_HOURS = 168;

/** How long an unfinished upload lives after its creation: UPLOAD_TTL_HOURS (decimals allowed), default 7 days. */
export function uploadExpiryMs(): number {
	const hours = Number(env.UPLOAD_TTL_HOURS ?? DEFAULT_EXPIRY_HOURS);
	return (Number.isFinite(hours) && hours > 0 ? hours : DEFAULT_EXPIRY_HOURS) * 3_600_000;
}

/** Bytes the upload disk keeps free: UPLOAD_FREE_FLOOR, else 5 % of the disk. */
export function freeFloorBytes(diskBytes: number): number {
	const configured = Number(env.UPLOAD_FREE_FLOOR || NaN);
	return Number.isFinite(configured) && configured >= 0
		? configured
		: Math.ceil(diskBytes * DEFAULT_FLOOR_SHARE);
}

/** A refusal @tus/server sends as the response: its errors carry status_code and body. */
export class UploadRefused extends Error {
	constructor(
		readonly status_code: number,
		readonly body: string
	) {
		super(body);
	}
}

/** What a channel holds against its quota: finished footage, and what unfinished uploads promise. */
export async function storageInUse(
	channelId: string,
	largestUpload: number,
	executor: Kysely<Database> | Transaction<Database> = db
) {
	const { rows } = await sql<{ quotaGb: number; finished: number; promised: number }>`
		SELECT c.storage_quota_gb AS quota_gb,
			(SELECT coalesce(sum(f.size_bytes), 0) FROM footage f WHERE f.channel_id = c.id) AS finished,
			(SELECT coalesce(sum(coalesce(u.size_bytes, ${largestUpload}::bigint)), 0) FROM upload u
			 WHERE u.channel_id = c.id AND u.completed_at IS NULL) AS promised
		FROM channel c WHERE c.id = ${channelId}`.execute(executor);
	const row = rows[0] ?? { quotaGb: 0, finished: 0, promised: 0 };
	return {
		quotaBytes: Number(row.quotaGb) * GB,
		usedBytes: Number(row.finished) + Number(row.promised)
	};
}

/** Bytes still to arrive for every unfinished upload on this disk (declared length less what is written). */
async function promisedOnDisk(trx: Transaction<Database>, directory: string, largest: number) {
	const unfinished = await trx
		.selectFrom('upload')
		.select(['id', 'sizeBytes'])
		.where('completedAt', 'is', null)
		.execute();
	let promised = 0;
	for (const upload of unfinished) {
		const written = await stat(path.join(directory, upload.id)).then(
			(file) => file.size,
			() => 0
		);
		promised += Math.max(0, (upload.sizeBytes ?? largest) - written);
	}
	return promised;
}

/**
 * Records a new upload if the channel's quota and the disk's free-space floor allow its declared
 * length; otherwise throws 413 (quota) or 507 (disk) with what to do, and nothing is stored.
 */
export async function reserveUpload(
	upload: Insertable<UploadTable>,
	limits: { directory: string; largestUpload: number }
): Promise<void> {
	const lengthUnknown = upload.sizeBytes === null || upload.sizeBytes === undefined;
	const needed = upload.sizeBytes ?? limits.largestUpload;
	const fileNeeds = lengthUnknown
		? `this file did not say its size, so it counts as the largest upload allowed (${formatBytes(needed)}) until it finishes`
		: `this file needs ${formatBytes(needed)}`;
	await mkdir(limits.directory, { recursive: true });
	await db.transaction().execute(async (trx) => {
		// One creation at a time, across every server on this database: two uploads created
		// together must not both count the same last free space.
		await sql`SELECT pg_advisory_xact_lock(hashtext('wrenchroll upload space'))`.execute(trx);

		const storage = await storageInUse(upload.channelId, limits.largestUpload, trx);
		if (storage.usedBytes + needed > storage.quotaBytes) {
			const left = Math.max(0, storage.quotaBytes - storage.usedBytes);
			throw new UploadRefused(
				413,
				`Not enough room left in this channel's storage quota: ${fileNeeds}, and ${formatBytes(left)} ` +
					`of the ${formatBytes(storage.quotaBytes)} quota is free (finished footage and unfinished ` +
					`uploads count). Nothing was stored. Delete footage you no longer need, cancel uploads ` +
					`that stalled, or ask a producer to raise the storage quota under Channel settings.\n`
			);
		}

		const disk = await statfs(limits.directory);
		const free = disk.bavail * disk.bsize;
		const floor = freeFloorBytes(disk.blocks * disk.bsize);
		const promised = await promisedOnDisk(trx, limits.directory, limits.largestUpload);
		if (free - promised - needed < floor) {
			throw new UploadRefused(
				507,
				`The upload disk is too full: ${fileNeeds}, ${formatBytes(free)} is free, ` +
					`${formatBytes(promised)} is promised to unfinished uploads and ${formatBytes(floor)} ` +
					`stays free for the server. Nothing was stored. Ask whoever runs the Wrenchroll server ` +
					`to free space or move uploads to a larger disk; cancelled and expired uploads give ` +
					`their space back.\n`
			);
		}

		await trx.insertInto('upload').values(upload).execute();
	});
}
