/**
 * Resumable uploads (tus 1.0.0) into UPLOAD_DIR with @tus/server and @tus/file-store, mounted at
 * /api/uploads from hooks.server.ts. Who may upload is checked before tus sees the request, so no
 * byte is stored for a caller without the right role. On completion the file is hashed (SHA-256,
 * streamed), probed with ffprobe when present, and recorded as a footage row.
 */
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { randomBytes } from 'node:crypto';
import path from 'node:path';
import { pipeline } from 'node:stream/promises';
import type { RequestEvent } from '@sveltejs/kit';
import { Server } from '@tus/server';
import { Metadata } from '@tus/utils';
import { z } from 'zod';
import { env } from '$env/dynamic/private';
import {
	ALLOWED_UPLOAD_TYPE,
	DEFAULT_MAX_UPLOAD_BYTES,
	UPLOAD_PATH,
	cleanFileName
} from '$lib/upload-rules';
import { text } from '$lib/schemas/fields';
import { db } from '../db';
import type { Role } from '../db/types';
import { isUuid } from '../auth/identity';
import { probeMedia } from './probe';
import { queueMediaOutputs } from '../media/queue';
import { reserveUpload, uploadExpiryMs } from './upload-limits';
import { bodySizeLimit, checkPatchBody } from './patch-body';
import { keepFinishedUpload } from './object-store';
import { PostgresLocker } from './tus-locker';
import { HashingFileStore, takeNodeBodies } from './upload-store';
import { uploadHashes } from './running-hash';
import { addCutVersion } from '../edit/cut-versions';
import { changeNoteSchema } from '$lib/schemas/cut-review';
import { stageLock } from '$lib/stages';

export const uploadDir = () => path.resolve(env.UPLOAD_DIR ?? 'uploads');
export const maxUploadBytes = () => Number(env.MAX_UPLOAD_BYTES ?? DEFAULT_MAX_UPLOAD_BYTES);
const TUS_ID = /^[0-9a-f]{32}$/;

/** Who may start an upload of each kind (producers may do both). */
export const UPLOAD_ROLES: Record<'footage' | 'cut', Role[]> = {
	footage: ['camera', 'producer'],
	cut: ['editor', 'producer']
};

const metadataSchema = z.object({
	episodeId: z.string().refine(isUuid, 'episodeId must be an episode of this channel.'),
	purpose: z.enum(['footage', 'cut']).default('footage'),
	filename: z.string().min(1, 'filename is required.').max(1000),
	filetype: z
		.string()
		.regex(
			ALLOWED_UPLOAD_TYPE,
			'Only video, audio and still-image files can be uploaded; SVG and other markup files are refused.'
		),
	clipName: text().trim().max(120).optional(),
	cameraLabel: text().trim().max(40).optional(),
	changeNote: changeNoteSchema.optional(),
	shootDayId: z
		.string()
		.refine(isUuid, 'shootDayId must be a shoot day of this episode.')
		.optional()
});

interface UploadClaim {
	channelId: string;
	personId: string;
	episodeId: string;
	shootDayId: string | null;
	purpose: 'footage' | 'cut';
	clipName: string;
	cameraLabel: string;
	changeNote: string;
	fileName: string;
	fileType: string;
}

/** The checked facts about a creation request, handed from the hook to tus's callbacks. */
const claims = new WeakMap<Request, UploadClaim>();

let server: Server | null = null;
/**
 * tus's per-upload locks, shared with the sweep of expired uploads: PostgreSQL advisory locks, so
 * every app process on the same database honours them (tus-locker.ts). Made on first use, so
 * `vite build` needs no database.
 */
let locker: PostgresLocker | null = null;
function uploadLocker(): PostgresLocker {
	locker ??= new PostgresLocker({ connectionString: env.DATABASE_URL ?? '' });
	return locker;
}

/** Lets go of the upload locks' connections (shutdown). */
export async function closeUploadLocks(): Promise<void> {
	const closing = locker;
	locker = null;
	await closing?.close();
}

function tusServer(): Server {
	if (server) return server;
	server = new Server({
		path: UPLOAD_PATH,
		// An unfinished upload expires this long after its creation (tus Expiration: Upload-Expires).
		datastore: new HashingFileStore({
			directory: uploadDir(),
			expirationPeriodInMilliseconds: uploadExpiryMs()
		}),
		locker: uploadLocker,
		maxSize: maxUploadBytes(),
		relativeLocation: true,
		respectForwardedHeaders: env.TRUST_PROXY === 'true',
		disableTerminationForFinishedUploads: true,
		namingFunction: () => randomBytes(16).toString('hex'),
		async onUploadCreate(req, upload) {
			const claim = claims.get(req as unknown as Request);
			if (!claim) throw { status_code: 403, body: 'Upload not authorised.\n' };
			// Quota and disk space are checked here, before tus creates the file: 413 or 507 otherwise.
			await reserveUpload(
				{ id: upload.id, ...claim, sizeBytes: upload.size ?? null },
				{ directory: uploadDir(), largestUpload: maxUploadBytes() }
			);
			return {};
		},
		async onUploadFinish(_req, upload) {
			// A deferred length (Upload-Defer-Length) is known by now: the size is what arrived.
			await recordFootage(upload.id, upload.size ?? upload.offset);
			return {};
		}
	});
	// A PATCH from server.js carries the Node.js request as its body (node-uploads.ts).
	takeNodeBodies(server);
	return server;
}

/** What the sweep of expired uploads needs: the folder, tus's store and its locks. */
export function sweepTools() {
	return { directory: uploadDir(), store: tusServer().datastore, locker: uploadLocker() };
}

export const tusError = (status: number, message: string) =>
	new Response(message + '\n', {
		status,
		headers: { 'Tus-Resumable': '1.0.0', 'Content-Type': 'text/plain; charset=utf-8' }
	});

/** Who is calling, as the identity look-up found them (App.Locals' fields). */
export type UploadCaller = Pick<App.Locals, 'person' | 'channel' | 'roles'>;

/** Authorises a tus request, then hands it to @tus/server. Used from hooks.server.ts (vite dev). */
export function handleUpload(event: RequestEvent): Promise<Response> {
	return answerUpload(event.request, event.url.pathname, event.locals);
}

/**
 * Authorises a tus request on `pathname` (under UPLOAD_PATH), then hands it to @tus/server: from
 * the SvelteKit hook, and in production from the Node.js server directly (node-uploads.ts).
 */
export async function answerUpload(
	request: Request,
	pathname: string,
	caller: UploadCaller
): Promise<Response> {
	const method = request.method;
	if (method === 'OPTIONS') return tusServer().handleWeb(request);
	const { person, channel, roles } = caller;
	if (!person || !channel) return tusError(401, 'Sign in to upload.');
	const rest = pathname.slice(UPLOAD_PATH.length).replace(/^\//, '');

	if (method === 'POST') {
		if (rest !== '') return tusError(404, 'Not found.');
		const parsed = metadataSchema.safeParse(
			Metadata.parse(request.headers.get('upload-metadata') ?? undefined)
		);
		if (!parsed.success)
			return tusError(400, parsed.error.issues.map((issue) => issue.message).join(' '));
		const meta = parsed.data;
		if (!UPLOAD_ROLES[meta.purpose].some((role) => roles.includes(role))) {
			return tusError(
				403,
				meta.purpose === 'cut'
					? 'Uploading a cut needs the editor or producer role.'
					: 'Uploading footage needs the camera or producer role.'
			);
		}
		const episode = await db
			.selectFrom('episode')
			.select(['id', 'stage'])
			.where('id', '=', meta.episodeId)
			.where('channelId', '=', channel.id)
			.executeTakeFirst();
		if (!episode) return tusError(404, 'That episode was not found in this channel.');
		// Picture lock fixes the approved version: no new cut arrives until a producer moves it back.
		const cutLock = meta.purpose === 'cut' ? stageLock(episode.stage, 'cut') : null;
		if (cutLock) return tusError(409, cutLock);
		if (meta.shootDayId) {
			const day = await db
				.selectFrom('shootDay')
				.select('id')
				.where('id', '=', meta.shootDayId)
				.where('episodeId', '=', meta.episodeId)
				.executeTakeFirst();
			if (!day) return tusError(404, 'That shoot day was not found for this episode.');
		}
		const fileName = cleanFileName(meta.filename);
		claims.set(request, {
			channelId: channel.id,
			personId: person.id,
			episodeId: meta.episodeId,
			shootDayId: meta.shootDayId ?? null,
			purpose: meta.purpose,
			clipName: meta.clipName || fileName.replace(/\.[^.]+$/, ''),
			cameraLabel: meta.cameraLabel ?? '',
			changeNote: meta.purpose === 'cut' ? (meta.changeNote ?? '') : '',
			fileName,
			fileType: meta.filetype.toLowerCase()
		});
		return tusServer().handleWeb(request);
	}

	// HEAD, PATCH, DELETE on one upload: it must be the caller's, in this channel (a producer may act on any).
	if (!TUS_ID.test(rest)) return tusError(404, 'Not found.');
	if (method !== 'HEAD' && method !== 'PATCH' && method !== 'DELETE')
		return tusError(405, 'Use HEAD, PATCH or DELETE on an upload.');
	const upload = await db
		.selectFrom('upload')
		.select(['personId', 'channelId'])
		.where('id', '=', rest)
		.executeTakeFirst();
	if (
		!upload ||
		upload.channelId !== channel.id ||
		(upload.personId !== person.id && !roles.includes('producer'))
	)
		return tusError(404, 'Not found.');
	if (method === 'PATCH') {
		const checked = await checkPatchBody(
			request,
			bodySizeLimit(env.BODY_SIZE_LIMIT),
			path.join(uploadDir(), '.incoming')
		);
		if ('refused' in checked) return tusError(checked.refused.status, checked.refused.message);
		try {
			return await tusServer().handleWeb(checked.request);
		} finally {
			await checked.release();
		}
	}
	const response = await tusServer().handleWeb(request);
	if (method === 'DELETE' && response.status === 204)
		await db.deleteFrom('upload').where('id', '=', rest).where('completedAt', 'is', null).execute();
	return response;
}

/** Streams the file through SHA-256: memory stays flat whatever the file's size. */
export async function sha256OfFile(file: string): Promise<string> {
	const hash = createHash('sha256');
	await pipeline(createReadStream(file, { highWaterMark: 1024 * 1024 }), hash);
	return hash.digest('hex');
}

async function recordFootage(uploadId: string, sizeBytes: number): Promise<void> {
	const upload = await db
		.selectFrom('upload')
		.selectAll()
		.where('id', '=', uploadId)
		.executeTakeFirstOrThrow();
	const file = path.join(uploadDir(), uploadId);
	// The SHA-256 taken as the bytes arrived (running-hash.ts), else one more pass over the file.
	const running = await uploadHashes.digest(uploadId, sizeBytes);
	const [sha256, probe] = await Promise.all([running ?? sha256OfFile(file), probeMedia(file)]);
	// With object storage set up, the finished file moves to the bucket now (object-store.ts).
	const storedIn = await keepFinishedUpload(uploadId, upload.fileType);
	const inserted = await db.transaction().execute(async (trx) => {
		const row = await trx
			.insertInto('footage')
			.values({
				channelId: upload.channelId,
				episodeId: upload.episodeId,
				shootDayId: upload.shootDayId,
				uploadId,
				purpose: upload.purpose,
				cameraLabel: upload.cameraLabel,
				clipName: upload.clipName,
				fileName: upload.fileName,
				fileType: upload.fileType,
				sizeBytes,
				sha256,
				durationSeconds: probe.durationSeconds,
				frameRate: probe.frameRate,
				videoCodec: probe.videoCodec,
				probeNote: probe.note,
				videoProfile: probe.videoProfile,
				pixelFormat: probe.pixelFormat,
				variableFrameRate: probe.variableFrameRate,
				width: probe.width,
				height: probe.height,
				startTimecode: probe.startTimecode,
				audioChannels: probe.audioChannels,
				bitRate: probe.bitRate,
				storedIn,
				uploadedBy: upload.personId
			})
			.onConflict((oc) => oc.column('uploadId').doNothing())
			.returning('id')
			.executeTakeFirst();
		// Each cut upload is the episode's next numbered version (unless the picture was locked while
		// it arrived); open comments move to it.
		if (row && upload.purpose === 'cut')
			await addCutVersion(trx, upload.episodeId, row.id, upload.changeNote);
		await trx
			.updateTable('upload')
			.set({ completedAt: new Date(), sizeBytes })
			.where('id', '=', uploadId)
			.execute();
		return row;
	});
	// The proxy, poster, thumbnails and waveform are made by the media worker (media/queue.ts).
	if (inserted) await queueMediaOutputs(inserted.id, probe);
}
