/**
 * The database a one-off script (migrate, seed, bench:seed) works on: DATABASE_URL, or the
 * embedded cluster, started if npm start isn't already running it. `done()` stops a cluster this
 * script started and leaves one npm start is using alone.
 */
import { startCluster } from './postgres.ts';
import { EMBEDDED_DATABASE, EMBEDDED_PG_DIR, EMBEDDED_PG_PORT } from './config.ts';

export async function scriptDatabase(): Promise<{ url: string; done: () => void }> {
	const cluster = process.env.DATABASE_URL
		? null
		: await startCluster({
				dataDir: EMBEDDED_PG_DIR,
				port: EMBEDDED_PG_PORT,
				database: EMBEDDED_DATABASE
			});
	return {
		url: process.env.DATABASE_URL ?? cluster!.url,
		done: () => {
			if (cluster?.startedHere) cluster.stop();
		}
	};
}
