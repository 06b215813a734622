/**
 * Wrenchroll's media worker: `npm run worker` (or `node worker.js [build folder]`) after
 * `npm run build`. It loads the same build as server.js with WRENCHROLL_PROCESS=worker, so the
 * app's init hook starts taking media jobs (proxies, poster frames, thumbnails, waveforms; see
 * src/lib/server/media/queue.ts) instead of serving HTTP. Run as many as the machine has cores to
 * spare, on any machine that reaches the same PostgreSQL and footage storage. SIGTERM or SIGINT
 * stops it: a job still running goes back to the queue and another worker finishes it.
 *
 * Settings: DATABASE_URL, UPLOAD_DIR, WRENCHROLL_MEDIA_CONCURRENCY (jobs at once, default 1),
 * WRENCHROLL_MEDIA_STALE_SECONDS (how long a silent job waits before another worker takes it
 * over, default 30), FFMPEG_PATH and FFPROBE_PATH.
 */
import path from 'node:path';
import process from 'node:process';
import { pathToFileURL } from 'node:url';

process.env.WRENCHROLL_PROCESS = 'worker';
const buildDir = path.resolve(
	import.meta.dirname,
	process.argv[2] ?? process.env.WRENCHROLL_BUILD_DIR ?? 'build'
);
await import(pathToFileURL(path.join(buildDir, 'handler.js')).href);
console.log('media worker: taking jobs');
