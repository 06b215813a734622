/** What every benchmark script needs around the built server: ports, a migrated and seeded cluster, sign-in. */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { chmodSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { Agent, request } from 'node:http';
import { brotliDecompressSync, gunzipSync, inflateSync } from 'node:zlib';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { startCluster, type Cluster } from './postgres.ts';
import { projectRoot } from './config.ts';
import { serverProcessArgs } from './server-entry.ts';

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

/**
 * CPU time (user + system, milliseconds) a process and every process below it have used so far,
 * from Linux's /proc (proc(5): utime and stime in clock ticks, 100 a second on Linux). null where
 * there is no /proc. The benches read it before and after a measured window to print each server's
 * CPU per request: a tsx baseline runs as a child of tsx's own process, hence the whole tree.
 */
export function processTreeCpuMs(pid: number): number | null {
	if (!existsSync('/proc/self/stat')) return null;
	const stats = new Map<number, { parent: number; ticks: number }>();
	for (const entry of readdirSync('/proc')) {
		if (!/^\d+$/.test(entry)) continue;
		try {
			stats.set(Number(entry), processStat(Number(entry)));
		} catch {
			// The process ended while the list was read.
		}
	}
	const inTree = (candidate: number): boolean => {
		for (let at: number | undefined = candidate; at && at > 1; at = stats.get(at)?.parent)
			if (at === pid) return true;
		return false;
	};
	let ticks = 0;
	for (const [candidate, { ticks: used }] of stats) if (inTree(candidate)) ticks += used;
	return ticks * 10;
}

/** A process's parent and its CPU so far in clock ticks (utime + stime), from /proc/<pid>/stat. */
function processStat(pid: number): { parent: number; ticks: number } {
	// Fields after the command's closing parenthesis: state, ppid, … utime (14th), stime (15th).
	const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ').at(-1)!.split(' ');
	return { parent: Number(fields[1]), ticks: Number(fields[11]) + Number(fields[12]) };
}

/** CPU time (user + system, milliseconds) one process has used so far, from /proc/<pid>/stat. */
export const processCpuMs = (pid: number): number => processStat(pid).ticks * 10;

/** A bare baseline server started by a bench: its address, and `stop()` before the cluster stops. */
export interface BareServer {
	base: string;
	/** The process started (tsx's own, with the server below it). */
	pid: number;
	/** Ends the server and waits for it to exit, so its pool is not cut off by the cluster stopping. */
	stop(): Promise<void>;
}

/**
 * Starts one of the bare baselines (`scripts/lib/bare-*-server.ts`) with tsx on a free loopback
 * port, against `databaseUrl`, with `env` added; the caller waits for the path it will ask.
 */
export async function startBareServer(
	script: string,
	databaseUrl: string,
	env: Record<string, string> = {}
): Promise<BareServer> {
	const port = await freePort();
	const child = spawn(
		path.join(projectRoot, 'node_modules/.bin/tsx'),
		[path.join(projectRoot, 'scripts/lib', script)],
		{
			env: { ...process.env, DATABASE_URL: databaseUrl, PORT: String(port), ...env },
			stdio: ['ignore', 'ignore', 'inherit']
		}
	);
	return {
		base: `http://127.0.0.1:${port}`,
		pid: child.pid!,
		async stop() {
			if (child.exitCode !== null || child.signalCode !== null) return;
			const exited = new Promise((resolve) => child.once('exit', resolve));
			child.kill('SIGTERM');
			await exited;
		}
	};
}

/** Runs scripts/migrate.ts or scripts/seed.ts against a database, as npm start does. */
export function runScript(script: string, databaseUrl: string) {
	const result = spawnSync(path.join(projectRoot, 'node_modules/.bin/tsx'), [script], {
		cwd: projectRoot,
		env: { ...process.env, DATABASE_URL: databaseUrl },
		encoding: 'utf8'
	});
	if (result.status !== 0) throw new Error(`${script} failed:\n${result.stdout}\n${result.stderr}`);
}

/** Signs in through the real form and returns the session cookie header. */
export async function signInCookie(
	baseUrl: string,
	email: string,
	password = 'wrenchroll-demo-bay3'
): Promise<string> {
	const response = await fetch(`${baseUrl}/signin`, {
		method: 'POST',
		headers: {
			origin: baseUrl,
			accept: 'text/html',
			'content-type': 'application/x-www-form-urlencoded'
		},
		body: new URLSearchParams({ email, password }),
		redirect: 'manual'
	});
	if (response.status !== 303)
		throw new Error(`signing in as ${email} answered ${response.status}`);
	return response.headers
		.getSetCookie()
		.map((line) => line.split(';')[0])
		.filter((pair) => !pair.endsWith('='))
		.join('; ');
}

type BenchAnswer = { status: number; headers: Headers; body: string; wallMilliseconds: number };

/** A signed-in person's GETs (and JSON POSTs), timed on the wall clock; the body is read in full. */
export interface BenchSession {
	get(pathname: string): Promise<BenchAnswer>;
	post(pathname: string, json: unknown): Promise<BenchAnswer>;
}

/**
 * One request over a kept-alive node:http connection, timed from the call to the body's last
 * byte, decoded. node:http, not fetch: undici's fetch adds about 1–2 ms of the client's own work
 * to each request on these machines, which a bench of one request at a time would count as the
 * server's. It asks as fetch does over http (`Accept-Encoding: gzip, deflate`), so the server
 * compresses its answers as it does for a browser, and the body is unpacked inside the timing.
 */
function timedRequest(
	agent: Agent,
	url: string,
	options: { method: string; headers: Record<string, string>; body?: string }
): Promise<BenchAnswer> {
	return new Promise((resolve, reject) => {
		const started = performance.now();
		const outgoing = request(
			url,
			{ agent, method: options.method, headers: options.headers },
			(incoming) => {
				const chunks: Buffer[] = [];
				incoming.on('data', (chunk: Buffer) => chunks.push(chunk));
				incoming.on('error', reject);
				incoming.on('end', () => {
					const raw = Buffer.concat(chunks);
					const encoding = incoming.headers['content-encoding'];
					const body = (
						encoding === 'gzip'
							? gunzipSync(raw)
							: encoding === 'deflate'
								? inflateSync(raw)
								: encoding === 'br'
									? brotliDecompressSync(raw)
									: raw
					).toString('utf8');
					const wallMilliseconds = performance.now() - started;
					const headers = new Headers();
					for (let index = 0; index < incoming.rawHeaders.length; index += 2)
						headers.append(incoming.rawHeaders[index], incoming.rawHeaders[index + 1]);
					resolve({
						status: incoming.statusCode ?? 0,
						headers,
						body,
						wallMilliseconds
					});
				});
			}
		);
		outgoing.on('error', reject);
		outgoing.end(options.body);
	});
}

export async function signedInSession(baseUrl: string, email: string): Promise<BenchSession> {
	return benchClient(baseUrl, await signInCookie(baseUrl, email));
}

/**
 * GETs and JSON POSTs to one server through the benches' client (timedRequest), with this cookie
 * if any. A bench comparing the app with a bare server asks both through it.
 */
export function benchClient(baseUrl: string, cookie?: string): BenchSession {
	const agent = new Agent({ keepAlive: true, maxSockets: 4 });
	const base: Record<string, string> = {
		'accept-encoding': 'gzip, deflate',
		...(cookie ? { cookie } : {})
	};
	const timed = (pathname: string, init: Parameters<typeof timedRequest>[2]) =>
		timedRequest(agent, baseUrl + pathname, init).catch((failure) => {
			// A kept-alive connection the server closed (idle past its keep-alive timeout) just as
			// it was reused: ask once more, and time only that.
			if (failure?.code !== 'ECONNRESET') throw failure;
			return timedRequest(agent, baseUrl + pathname, init);
		});
	return {
		get: (pathname) => timed(pathname, { method: 'GET', headers: base }),
		post: (pathname, json) =>
			timed(pathname, {
				method: 'POST',
				headers: { ...base, origin: baseUrl, 'content-type': 'application/json' },
				body: JSON.stringify(json)
			})
	};
}

/** Restarts the cluster with pg_stat_statements loaded (it must be preloaded) and creates the extension. */
export async function withStatementCounting(
	start: () => Promise<Cluster>,
	cluster: Cluster
): Promise<Cluster> {
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

export interface BenchWorld {
	buildDir: string;
	cluster: Cluster;
	/** Queries against the bench database (not through the app). */
	pool: pg.Pool;
	/**
	 * Starts the built server against the bench database, with these further settings if any;
	 * answers its base URL once it is up. One server at a time: stop the last one first.
	 */
	startServer(env?: Record<string, string>): Promise<string>;
	/** Stops the running server (close does too). */
	stopServer(): Promise<void>;
	/** The running server's process id (for its memory in /proc), or null before startServer. */
	serverPid(): number | null;
	/** The bench's own folder, removed by close. */
	work: string;
	/** Stops the server and the cluster and removes the bench folder. */
	close(): Promise<void>;
}

/**
 * A throwaway world for a benchmark: a PostgreSQL cluster with pg_stat_statements, migrated and
 * seeded with the real scripts, and the built server on demand. Exits when there is no build.
 */
export async function openBenchWorld(name: string): Promise<BenchWorld> {
	const buildDir = path.resolve(projectRoot, process.env.WRENCHROLL_BUILD_DIR ?? 'build');
	if (!existsSync(path.join(buildDir, 'index.js'))) {
		console.error(`No built server in ${buildDir}: run npm run build first.`);
		process.exit(1);
	}
	const work = mkdtempSync(path.join(tmpdir(), `wrenchroll-${name}-`));
	chmodSync(work, 0o755); // the postgres OS user must reach the cluster folder inside
	const pgPort = await freePort();
	const start = () =>
		startCluster({ dataDir: path.join(work, 'pg'), port: pgPort, database: 'wrenchroll_bench' });
	const cluster = await withStatementCounting(start, await start());
	runScript('scripts/migrate.ts', cluster.url);
	runScript('scripts/seed.ts', cluster.url);
	const pool = new pg.Pool({ connectionString: cluster.url, max: 2 });
	let server: ChildProcess | null = null;
	const stopServer = async () => {
		const running = server as ChildProcess | null;
		server = null;
		if (running && running.exitCode === null && running.signalCode === null) {
			const exited = new Promise((resolve) => running.once('exit', resolve));
			running.kill('SIGTERM');
			await exited;
		}
	};
	return {
		buildDir,
		cluster,
		pool,
		work,
		async startServer(env = {}) {
			if (server) throw new Error('a bench server is running already: stopServer() first');
			const port = await freePort();
			const baseUrl = `http://127.0.0.1:${port}`;
			server = spawn(process.execPath, serverProcessArgs(buildDir), {
				env: {
					...process.env,
					NODE_ENV: 'production',
					WRENCHROLL_BUILD_DIR: buildDir,
					HOST: '127.0.0.1',
					PORT: String(port),
					ORIGIN: baseUrl,
					DATABASE_URL: cluster.url,
					AUTH_SECRET: randomBytes(32).toString('base64url'),
					UPLOAD_DIR: path.join(work, 'uploads'),
					...env
				},
				stdio: ['ignore', 'ignore', 'inherit']
			});
			await waitForHttp(`${baseUrl}/healthz`, 30_000);
			return baseUrl;
		},
		stopServer,
		serverPid: () => server?.pid ?? null,
		async close() {
			await pool.end();
			await stopServer();
			cluster.stop();
			rmSync(work, { recursive: true, force: true });
		}
	};
}
