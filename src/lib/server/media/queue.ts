/**
 * The media jobs: after an upload completes, the proxy, poster frame, thumbnails and waveform are
 * made by a worker, one job each, through pg-boss (a job queue kept in the PostgreSQL we already
 * run, schema `pgboss`). Jobs survive restarts and are retried with backoff; `media_output` holds
 * what the crew sees (state, progress, the file) and a heartbeat.
 *
 * Who runs the jobs: `npm run worker` (worker.js: the build with WRENCHROLL_PROCESS=worker), or the
 * app process itself when WRENCHROLL_MEDIA_WORKER=inline (`npm start` and the tests do this). Any
 * app process only sends jobs.
 *
 * A worker killed mid-job (kill -9) stops refreshing its heartbeat. Every worker looks for such
 * jobs every few seconds; one found is failed in pg-boss, which retries it, and a live worker
 * finishes it. pg-boss's own expiry stays as the last resort and is sized to the clip's length.
 */
import PgBoss from 'pg-boss';
import { env } from '$env/dynamic/private';
import { db } from '../db';
import type { ProbeResult } from '../footage/probe';
import { MEDIA_KINDS, type MediaKind } from '$lib/media';
import { ffmpegAvailable, makeOutput, type MakeContext } from './makers';

export const MEDIA_QUEUE = 'media-output';
const RETRY_LIMIT = 3;

interface JobData {
	footageId: string;
	kind: MediaKind;
}

let boss: Promise<PgBoss> | null = null;
let worker: { stop: () => Promise<void> } | null = null;

function staleSeconds(): number {
	return Math.max(3, Number(env.WRENCHROLL_MEDIA_STALE_SECONDS ?? 30));
}

/** One pg-boss per process, started on first use. Only a worker process supervises (expiry, archive). */
function queue(supervise = false): Promise<PgBoss> {
	boss ??= (async () => {
		const instance = new PgBoss({
			connectionString: env.DATABASE_URL,
			schema: 'pgboss',
			max: 3,
			supervise,
			schedule: false,
			maintenanceIntervalSeconds: 60
		});
		instance.on('error', (failure) => console.error('media queue:', failure.message));
		await instance.start();
		await instance.createQueue(MEDIA_QUEUE, {
			name: MEDIA_QUEUE,
			retryLimit: RETRY_LIMIT,
			retryDelay: 5,
			retryBackoff: true
		});
		return instance;
	})();
	boss.catch(() => (boss = null));
	return boss;
}

/** Which outputs a clip gets: picture ones when it has video, a waveform when it has sound. */
export function outputsFor(
	probe: Pick<ProbeResult, 'videoCodec' | 'width' | 'audioChannels' | 'durationSeconds'>
): {
	make: MediaKind[];
	skip: { kind: MediaKind; message: string }[];
} {
	const make: MediaKind[] = [];
	const skip: { kind: MediaKind; message: string }[] = [];
	const hasPicture = probe.width !== null;
	const hasSound = probe.audioChannels !== null;
	for (const kind of MEDIA_KINDS) {
		const needs = kind === 'peaks' ? hasSound : hasPicture;
		if (needs && probe.durationSeconds) make.push(kind);
		else
			skip.push({
				kind,
				message: !probe.durationSeconds
					? 'Not a clip ffprobe could read, so nothing is made from it.'
					: kind === 'peaks'
						? 'This clip has no sound.'
						: 'This clip has no picture.'
			});
	}
	return { make, skip };
}

/** pg-boss's own time limit for a job: generous, from the clip's length (a 2 h clip gets 13 h). */
function expiryFor(durationSeconds: number | null): number {
	return Math.min(20 * 3600, Math.round(600 + 6 * (durationSeconds ?? 60)));
}

/** Sends one job per output and notes each job's id on its row. */
async function sendJobs(
	footageId: string,
	kinds: readonly MediaKind[],
	durationSeconds: number | null
): Promise<void> {
	const instance = await queue();
	for (const kind of kinds) {
		const jobId = await instance.send(MEDIA_QUEUE, { footageId, kind } satisfies JobData, {
			expireInSeconds: expiryFor(durationSeconds)
		});
		if (jobId)
			await db
				.updateTable('mediaOutput')
				.set({ jobId })
				.where('footageId', '=', footageId)
				.where('kind', '=', kind)
				.execute();
	}
}

/**
 * Records what will be made from a finished upload and sends one job per output. Without ffmpeg
 * on the server the rows say so (with the install line) and no job is sent.
 */
export async function queueMediaOutputs(footageId: string, probe: ProbeResult): Promise<void> {
	const { make, skip } = outputsFor(probe);
	const missing = !ffmpegAvailable();
	const rows = [
		...skip.map(({ kind, message }) => ({ footageId, kind, state: 'skipped' as const, message })),
		...make.map((kind) =>
			missing
				? {
						footageId,
						kind,
						state: 'skipped' as const,
						message:
							'ffmpeg is not installed on the server, so no proxy, thumbnails or waveform are made. Install it (apt-get install ffmpeg), then upload again.'
					}
				: { footageId, kind, state: 'waiting' as const, message: null }
		)
	];
	await db
		.insertInto('mediaOutput')
		.values(rows)
		.onConflict((oc) => oc.columns(['footageId', 'kind']).doNothing())
		.execute();
	if (missing || make.length === 0) return;
	try {
		await sendJobs(footageId, make, probe.durationSeconds);
	} catch (failure) {
		// The footage is saved either way; the rows say the outputs could not be queued.
		await db
			.updateTable('mediaOutput')
			.set({
				state: 'failed',
				message: `Could not queue this: ${(failure as Error).message}. Try again from the footage page.`,
				updatedAt: new Date()
			})
			.where('footageId', '=', footageId)
			.where('state', '=', 'waiting')
			.execute();
	}
}

/** Sends the clip's failed outputs to the queue again (the footage page's "Try again"). */
export async function requeueOutputs(
	footageId: string,
	durationSeconds: number | null
): Promise<number> {
	const failed = await db
		.updateTable('mediaOutput')
		.set({ state: 'waiting', progress: 0, attempts: 0, message: null, updatedAt: new Date() })
		.where('footageId', '=', footageId)
		.where('state', '=', 'failed')
		.returning(['kind'])
		.execute();
	if (failed.length === 0) return 0;
	await sendJobs(
		footageId,
		failed.map(({ kind }) => kind),
		durationSeconds
	);
	return failed.length;
}

/** Runs one job: claims the row, makes the output with a heartbeat, records the result. */
async function runJob(job: PgBoss.Job<JobData>): Promise<void> {
	const { footageId, kind } = job.data;
	const claimed = await db
		.updateTable('mediaOutput')
		.set((eb) => ({
			state: 'working',
			progress: 0,
			jobId: job.id,
			attempts: eb('attempts', '+', 1),
			heartbeatAt: new Date(),
			message: null,
			updatedAt: new Date()
		}))
		.where('footageId', '=', footageId)
		.where('kind', '=', kind)
		.where('state', '!=', 'done')
		.returning(['attempts'])
		.executeTakeFirst();
	if (!claimed) return; // already made, or the clip was deleted
	let progress = 0;
	const beat = async () =>
		db
			.updateTable('mediaOutput')
			.set({ heartbeatAt: new Date(), progress, updatedAt: new Date() })
			.where('footageId', '=', footageId)
			.where('kind', '=', kind)
			.where('jobId', '=', job.id)
			.where('state', '=', 'working')
			.execute()
			.catch(() => undefined);
	const heart = setInterval(beat, Math.max(1000, (staleSeconds() * 1000) / 4));
	const context: MakeContext = {
		onProgress(value) {
			progress = Math.max(progress, Math.min(0.99, value));
		}
	};
	try {
		const made = await makeOutput(footageId, kind, context);
		await db
			.updateTable('mediaOutput')
			.set({
				state: 'done',
				progress: 1,
				storageKey: made.storageKey,
				bytes: made.bytes,
				details: made.details === undefined ? null : JSON.stringify(made.details),
				message: null,
				heartbeatAt: null,
				updatedAt: new Date()
			})
			.where('footageId', '=', footageId)
			.where('kind', '=', kind)
			.execute();
	} catch (failure) {
		const last = claimed.attempts > RETRY_LIMIT;
		await db
			.updateTable('mediaOutput')
			.set({
				state: last ? 'failed' : 'waiting',
				message: last
					? `Could not make this: ${(failure as Error).message}`
					: `Trying again (${(failure as Error).message})`,
				heartbeatAt: null,
				updatedAt: new Date()
			})
			.where('footageId', '=', footageId)
			.where('kind', '=', kind)
			.execute();
		throw failure;
	} finally {
		clearInterval(heart);
	}
}

/**
 * Jobs whose worker stopped beating (killed, or its machine gone) go back to the queue: the row
 * waits again and pg-boss retries the job for a live worker.
 */
export async function reclaimStaleJobs(): Promise<number> {
	const stale = await db
		.updateTable('mediaOutput')
		.set({
			state: 'waiting',
			message: 'The worker making this stopped; another one takes it over.',
			heartbeatAt: null,
			updatedAt: new Date()
		})
		.where('state', '=', 'working')
		.where('heartbeatAt', '<', new Date(Date.now() - staleSeconds() * 1000))
		.returning(['jobId'])
		.execute();
	const ids = stale.map((row) => row.jobId).filter((id): id is string => id !== null);
	if (ids.length) {
		const instance = await queue();
		for (const id of ids) await instance.fail(MEDIA_QUEUE, id, { message: 'worker stopped' });
	}
	return stale.length;
}

/** Starts taking media jobs in this process (`npm run worker`, or inline in `npm start`). */
export async function startMediaWorker(): Promise<void> {
	if (worker) return;
	const instance = await queue(true);
	const concurrency = Math.max(1, Number(env.WRENCHROLL_MEDIA_CONCURRENCY ?? 1));
	for (let i = 0; i < concurrency; i++)
		await instance.work<JobData>(
			MEDIA_QUEUE,
			{ batchSize: 1, pollingIntervalSeconds: 1 },
			async ([job]) => runJob(job)
		);
	const sweep = setInterval(
		() =>
			void reclaimStaleJobs().catch((failure) => console.error('media sweep:', failure.message)),
		Math.max(1000, (staleSeconds() * 1000) / 2)
	);
	worker = {
		async stop() {
			clearInterval(sweep);
		}
	};
}

/** Stops taking jobs; a job still running is failed back to the queue by pg-boss and retried. */
export async function stopMedia(): Promise<void> {
	await worker?.stop();
	worker = null;
	const instance = await boss?.catch(() => null);
	boss = null;
	await instance?.stop({ graceful: true, wait: true, timeout: 10_000 });
}
