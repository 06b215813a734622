/** What every benchmark script needs around the built server: ports, a migrated and seeded cluster, sign-in. */
import { spawnSync } from 'node:child_process';
import { createServer } from 'node:net';
import path from 'node:path';
import pg from 'pg';
import type { Cluster } from './postgres.ts';
import { projectRoot } from './config.ts';

export function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const server = createServer();
		server.on('error', reject);
		server.listen(0, '127.0.0.1', () => {
			const address = server.address();
			server.close(() => resolve(typeof address === 'object' && address ? address.port : 0));
		});
	});
}

export async function waitForHttp(url: string, timeoutMs: number) {
	const deadline = Date.now() + timeoutMs;
	while (Date.now() < deadline) {
		try {
			if ((await fetch(url)).ok) return;
		} catch {
			// not up yet
		}
		await new Promise((resolve) => setTimeout(resolve, 150));
	}
	throw new Error(`${url} did not answer within ${timeoutMs} ms`);
}

/** Runs scripts/migrate.ts or scripts/seed.ts against a database, as npm start does. */
export function runScript(script: string, databaseUrl: string) {
	const result = spawnSync(path.join(projectRoot, 'node_modules/.bin/tsx'), [script], { cwd: projectRoot, env: { ...process.env, DATABASE_URL: databaseUrl }, encoding: 'utf8' });
	if (result.status !== 0) throw new Error(`${script} failed:\n${result.stdout}\n${result.stderr}`);
}

/** Signs in through the real form and returns the session cookie header. */
export async function signInCookie(baseUrl: string, email: string, password = 'wrenchroll-demo-bay3'): Promise<string> {
	const response = await fetch(`${baseUrl}/signin`, {
		method: 'POST',
		headers: { origin: baseUrl, accept: 'text/html', 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({ email, password }),
		redirect: 'manual'
	});
	if (response.status !== 303) throw new Error(`signing in as ${email} answered ${response.status}`);
	return response.headers
		.getSetCookie()
		.map((line) => line.split(';')[0])
		.filter((pair) => !pair.endsWith('='))
		.join('; ');
}

/** Restarts the cluster with pg_stat_statements loaded (it must be preloaded) and creates the extension. */
export async function withStatementCounting(start: () => Promise<Cluster>, cluster: Cluster): Promise<Cluster> {
	const admin = new pg.Client({ connectionString: cluster.url });
	await admin.connect();
	await admin.query(`ALTER SYSTEM SET shared_preload_libraries = 'pg_stat_statements'`);
	await admin.end();
	cluster.stop();
	const restarted = await start();
	const client = new pg.Client({ connectionString: restarted.url });
	await client.connect();
	await client.query('CREATE EXTENSION IF NOT EXISTS pg_stat_statements');
	await client.end();
	return restarted;
}
