/** How every launcher (npm start, the tests' global setup, the benches) starts the built server. */
import path from 'node:path';

/** Arguments for `node` that serve the build in `buildDir`. */
export function serverProcessArgs(buildDir: string): string[] {
	return [path.join(buildDir, 'index.js')];
}
