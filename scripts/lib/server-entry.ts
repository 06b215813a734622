/**
 * How every launcher (npm start, the tests' global setup, the benches) starts the built server:
 * server.js at the project root (adapter-node's handler behind our own node:http server), with
 * WRENCHROLL_BUILD_DIR naming the build it serves.
 */
import path from 'node:path';
import { projectRoot } from './config.ts';

/** Arguments for `node` that serve the build in `buildDir`. */
export function serverProcessArgs(buildDir: string): string[] {
	return [path.join(projectRoot, 'server.js'), buildDir];
}
