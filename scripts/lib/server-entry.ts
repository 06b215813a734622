/**
 * How every launcher (npm start, the tests' global setup, the benches) starts the built server:
 * server.js at the project root (adapter-node's handler behind our own node:http server), with
 * WRENCHROLL_BUILD_DIR naming the build it serves.
 *
 * `--initial-old-space-size=128` (a V8 option, in MB): an upload brings in a fresh 64 KiB buffer
 * per socket read, held outside V8's heap until a collection frees it. With V8's default start,
 * some server processes ran about ten full collections a second during a 2 GiB upload (the
 * buffers counted against a heap limit set small at start-up) and spent 11–15 s of CPU on it
 * instead of about 4 s; which processes did varied from run to run. With the old generation's
 * first limit at 128 MB, upload runs showed no full collection at all, only young-generation
 * ones (npm run bench uploads, 2026-12-04; README, Benchmarks). It is a limit before the first
 * full collection, not memory taken: the process still starts at about 120 MB resident.
 */
import path from 'node:path';
import { projectRoot } from './config.ts';

/** V8 options every launcher gives the server process (see above). */
export const SERVER_NODE_OPTIONS = ['--initial-old-space-size=128'];

/** Arguments for `node` that serve the build in `buildDir`. */
export function serverProcessArgs(buildDir: string): string[] {
	return [...SERVER_NODE_OPTIONS, path.join(projectRoot, 'server.js'), buildDir];
}
