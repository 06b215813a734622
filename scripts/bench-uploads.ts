/**
 * Upload benchmark (not a test): a 2 GiB file over loopback through the built server with
 * tus-js-client, against a baseline measured in the same run: a bare Node.js HTTP server, in a
 * process of its own like the app's, that streams one request body to a file on the same disk.
 * Each server first takes one upload that is not counted (a warm-up, as in the episode bench: on
 * 2026-12-04 the app's first 2 GiB after start-up took it 6.6–8.0 s of CPU against 3.5–6.0 s for
 * later ones, the bare server's 3.5–3.7 s against 2.3–3.6 s). Then the two alternate (bare first,
 * then Wrenchroll first, …) for BENCH_REPETITIONS rounds (3), so both meet the same machine load.
 * Prints min, median and max of each throughput, the ratio of the medians and the range of the
 * per-round ratios (target: median ratio ≥ 0.85), the server's peak resident memory (the kernel's
 * high-water mark, VmHWM; target < 150 MB), and checks that every stored footage row carries the
 * SHA-256 of the bytes sent.
 *
 *   npm run bench uploads     (BENCH_UPLOAD_BYTES, BENCH_CHUNK, BENCH_REPETITIONS, BENCH_DIR)
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { createHash, randomBytes } from 'node:crypto';
import {
	chmodSync,
	closeSync,
	createReadStream,
	mkdtempSync,
	openSync,
	readFileSync,
	readdirSync,
	rmSync,
	writeSync
} from 'node:fs';
import { request } from 'node:http';
import path from 'node:path';
import pg from 'pg';
import * as tus from 'tus-js-client';
import { startCluster } from './lib/postgres.ts';
import { startFakeMail } from './lib/fake-mail.ts';
import { projectRoot } from './lib/config.ts';
import { freePort, processCpuMs, runScript, signInCookie, waitForHttp } from './lib/bench-world.ts';
import { serverProcessArgs } from './lib/server-entry.ts';
import { BODY_SIZE_LIMIT_BYTES, UPLOAD_CHUNK_BYTES } from '../src/lib/upload-rules.ts';

const SIZE = Number(process.env.BENCH_UPLOAD_BYTES ?? 2 * 1024 ** 3);
const REPETITIONS = Math.max(1, Number(process.env.BENCH_REPETITIONS ?? 3));
const RATIO_TARGET = 0.85;
const MEMORY_TARGET_MB = 150;
const work = mkdtempSync(
	path.join(process.env.BENCH_DIR ?? path.join(projectRoot, '.data'), 'bench-uploads-')
);
chmodSync(work, 0o755); // the postgres OS user must reach the cluster folder inside
const buildDir = path.resolve(projectRoot, process.env.WRENCHROLL_BUILD_DIR ?? 'build');
const uploadDir = path.join(work, 'uploads');

/** Writes the source file from one random block and answers the SHA-256 of its bytes. */
function makeSourceFile(file: string): string {
	const block = randomBytes(16 * 1024 * 1024);
	const hash = createHash('sha256');
	const fd = openSync(file, 'w');
	for (let written = 0; written < SIZE; written += block.length) {
		const piece = block.subarray(0, Math.min(block.length, SIZE - written));
		writeSync(fd, piece);
		hash.update(piece);
	}
	closeSync(fd);
	return hash.digest('hex');
}

/** The bare baseline: the plainest server that can store an upload, in its own process. */
const BARE_SERVER = `
import { createServer } from 'node:http';
import { createWriteStream } from 'node:fs';
import { pipeline } from 'node:stream/promises';
const target = process.argv[1];
const server = createServer((req, res) => {
	pipeline(req, createWriteStream(target)).then(
		() => res.writeHead(204).end(),
		() => res.writeHead(500).end()
	);
});
server.listen(0, '127.0.0.1', () => console.log(server.address().port));
`;

async function startBareServer(target: string): Promise<{ child: ChildProcess; port: number }> {
	const child = spawn(process.execPath, ['--input-type=module', '-e', BARE_SERVER, target], {
		stdio: ['ignore', 'pipe', 'inherit']
	});
	const port = await new Promise<number>((resolve, reject) => {
		child.stdout!.once('data', (line: Buffer) => resolve(Number(line.toString().trim())));
		child.once('exit', (code) => reject(new Error(`the bare server exited (${code})`)));
	});
	return { child, port };
}

/** One streamed POST of the whole file to the bare server; answers the seconds it took. */
async function bareSeconds(source: string, port: number): Promise<number> {
	const started = performance.now();
	await new Promise<void>((resolve, reject) => {
		const req = request(
			{ host: '127.0.0.1', port, method: 'POST', path: '/', headers: { 'content-length': SIZE } },
			(res) => {
				res.resume();
				res.on('end', () =>
					res.statusCode === 204 ? resolve() : reject(new Error(`bare: ${res.statusCode}`))
				);
			}
		);
		req.on('error', reject);
		createReadStream(source).pipe(req);
	});
	return (performance.now() - started) / 1000;
}

/** One tus upload of the whole file through Wrenchroll; answers the seconds and the upload's URL. */
async function wrenchrollSeconds(
	source: string,
	base: string,
	cookie: string,
	episodeId: string
): Promise<{ seconds: number; url: string }> {
	const started = performance.now();
	const url = await new Promise<string>((resolve, reject) => {
		const upload = new tus.Upload(createReadStream(source), {
			endpoint: `${base}/api/uploads`,
			chunkSize: Number(process.env.BENCH_CHUNK ?? UPLOAD_CHUNK_BYTES),
			headers: { cookie, origin: base },
			metadata: { filename: 'bench.mp4', filetype: 'video/mp4', episodeId },
			onError: reject,
			onSuccess: () => resolve(upload.url ?? '')
		});
		upload.start();
	});
	return { seconds: (performance.now() - started) / 1000, url };
}

/** CPU seconds (user + system) a process has used so far, from /proc/<pid>/stat (clock ticks of 1/100 s). */
function cpuSeconds(pid: number): number {
	return processCpuMs(pid) / 1000;
}

/** VmHWM (the peak resident memory so far) or VmRSS (now) of a process, in MB. */
function residentMegabytes(pid: number, field: 'VmHWM' | 'VmRSS' = 'VmHWM'): number {
	const status = readFileSync(`/proc/${pid}/status`, 'utf8');
	return Number(new RegExp(`${field}:\\s+(\\d+)`).exec(status)?.[1] ?? 0) / 1024;
}

const median = (values: number[]) => {
	const sorted = [...values].sort((a, b) => a - b);
	const middle = Math.floor(sorted.length / 2);
	return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
};
const spread = (values: number[], digits: number, unit = '') =>
	`min ${Math.min(...values).toFixed(digits)}${unit}, median ${median(values).toFixed(digits)}${unit}, max ${Math.max(...values).toFixed(digits)}${unit}`;

/** Removes what a round stored, so every round writes to the same free disk. */
function clearUploads() {
	for (const name of readdirSync(uploadDir))
		if (!name.startsWith('.')) rmSync(path.join(uploadDir, name), { force: true });
}

async function main(): Promise<boolean> {
	console.log(
		`upload benchmark: ${(SIZE / 1024 ** 3).toFixed(2)} GiB over loopback, tus chunk ${Number(process.env.BENCH_CHUNK ?? UPLOAD_CHUNK_BYTES) / 1024 ** 2} MiB, ${REPETITIONS} interleaved rounds, built server ${path.relative(projectRoot, buildDir) || buildDir}`
	);
	const source = path.join(work, 'source.bin');
	const sourceSha256 = makeSourceFile(source);
	const cluster = await startCluster({
		dataDir: path.join(work, 'pg'),
		port: await freePort(),
		database: 'bench'
	});
	const mail = await startFakeMail({ port: await freePort(), dir: path.join(work, 'mail') });
	let server: ChildProcess | null = null;
	let bare: ChildProcess | null = null;
	const db = new pg.Client({ connectionString: cluster.url });
	try {
		runScript('scripts/migrate.ts', cluster.url);
		runScript('scripts/seed.ts', cluster.url);
		await db.connect();
		const port = await freePort();
		const base = `http://127.0.0.1:${port}`;
		server = spawn(process.execPath, serverProcessArgs(buildDir), {
			env: {
				...process.env,
				NODE_ENV: 'production',
				WRENCHROLL_BUILD_DIR: buildDir,
				HOST: '127.0.0.1',
				PORT: String(port),
				ORIGIN: base,
				DATABASE_URL: cluster.url,
				SMTP_URL: mail.url,
				AUTH_SECRET: 'bench-secret-0123456789-0123456789',
				UPLOAD_DIR: uploadDir,
				BODY_SIZE_LIMIT: process.env.BENCH_BODY_LIMIT ?? String(BODY_SIZE_LIMIT_BYTES)
			},
			stdio: ['ignore', 'ignore', 'inherit']
		});
		await waitForHttp(`${base}/healthz`, 30_000);
		const cookie = await signInCookie(base, 'mika@torquehaven.test');
		const {
			rows: [episode]
		} = await db.query<{ id: string }>(
			`SELECT episode.id FROM episode JOIN channel ON channel.id = episode.channel_id
			 WHERE channel.name = 'Torquehaven Garage' ORDER BY episode.created_at LIMIT 1`
		);
		const [startedPeak, startedNow] = [
			residentMegabytes(server.pid!),
			residentMegabytes(server.pid!, 'VmRSS')
		];
		const bareServer = await startBareServer(path.join(work, 'bare.bin'));
		bare = bareServer.child;

		const bareTimes: number[] = [];
		const appTimes: number[] = [];
		/** CPU seconds per round: [server, this process (the client)]. */
		const bareCpu: [number, number][] = [];
		const appCpu: [number, number][] = [];
		const measureCpu = async (pid: number, into: [number, number][], run: () => Promise<void>) => {
			const [server0, client0] = [cpuSeconds(pid), process.cpuUsage()];
			await run();
			const client = process.cpuUsage(client0);
			into.push([cpuSeconds(pid) - server0, (client.user + client.system) / 1e6]);
		};
		const hashes: string[] = [];
		const mbps = (seconds: number) => (SIZE / 1e6 / seconds).toFixed(0);
		const cpu = ([server, client]: [number, number]) =>
			`CPU ${server.toFixed(1)} s server, ${client.toFixed(1)} s client`;
		/** One upload to the bare server; its time and CPU are kept unless it is the warm-up. */
		const runBare = async (keep: boolean) => {
			await measureCpu(bare!.pid!, keep ? bareCpu : warmCpu, async () => {
				const seconds = await bareSeconds(source, bareServer.port);
				(keep ? bareTimes : warmTimes).push(seconds);
			});
			rmSync(path.join(work, 'bare.bin'), { force: true });
		};
		/** One tus upload to Wrenchroll, its stored SHA-256 checked; kept unless it is the warm-up. */
		const runApp = async (keep: boolean) => {
			let url = '';
			await measureCpu(server!.pid!, keep ? appCpu : warmCpu, async () => {
				const done = await wrenchrollSeconds(source, base, cookie, episode.id);
				(keep ? appTimes : warmTimes).push(done.seconds);
				url = done.url;
			});
			const {
				rows: [footage]
			} = await db.query<{ sha256: string }>(`SELECT sha256 FROM footage WHERE upload_id = $1`, [
				url.split('/').pop()
			]);
			hashes.push(footage?.sha256 ?? 'none');
			clearUploads();
		};
		// One unmeasured upload to each first, as the episode bench warms up before it measures: a
		// server's first large upload after start-up costs it more (see the header).
		const warmTimes: number[] = [];
		const warmCpu: [number, number][] = [];
		await runBare(false);
		await runApp(false);
		console.log(
			`warm-up, not counted: bare ${mbps(warmTimes[0])} MB/s (${cpu(warmCpu[0])}), Wrenchroll ${mbps(warmTimes[1])} MB/s (${cpu(warmCpu[1])})`
		);
		for (let round = 0; round < REPETITIONS; round++) {
			if (round % 2 === 0) {
				await runBare(true);
				await runApp(true);
			} else {
				await runApp(true);
				await runBare(true);
			}
			console.log(
				`round ${round + 1}: bare ${mbps(bareTimes[round])} MB/s (${cpu(bareCpu[round])}), Wrenchroll ${mbps(appTimes[round])} MB/s (${cpu(appCpu[round])}), ratio ${(bareTimes[round] / appTimes[round]).toFixed(2)}`
			);
		}
		const peakMb = residentMegabytes(server.pid!);

		const throughput = (times: number[]) => times.map((seconds) => SIZE / 1e6 / seconds);
		const ratios = bareTimes.map((seconds, round) => seconds / appTimes[round]);
		const ratio = median(throughput(appTimes)) / median(throughput(bareTimes));
		const hashesOk = hashes.every((hash) => hash === sourceSha256);
		console.log(
			`\nbaseline (bare Node.js, one streamed POST, own process): ${spread(throughput(bareTimes), 0, ' MB/s')}`
		);
		console.log(
			`Wrenchroll (tus, SHA-256 while the bytes arrive): ${spread(throughput(appTimes), 0, ' MB/s')}`
		);
		console.log(`per-round ratio: ${spread(ratios, 2)}`);
		console.log(
			`ratio of the medians: ${ratio.toFixed(2)} (target ≥ ${RATIO_TARGET}) ${ratio >= RATIO_TARGET ? 'met' : 'MISSED'}`
		);
		console.log(
			`server peak resident memory (VmHWM): ${peakMb.toFixed(1)} MB (target < ${MEMORY_TARGET_MB} MB) ${peakMb < MEMORY_TARGET_MB ? 'met' : 'MISSED'}; after start-up, before any upload: ${startedNow.toFixed(0)} MB resident, peak ${startedPeak.toFixed(0)} MB`
		);
		console.log(
			`stored SHA-256 of every upload equals the source's: ${hashesOk ? 'yes' : `NO (${hashes.join(', ')})`}`
		);
		const ok = ratio >= RATIO_TARGET && peakMb < MEMORY_TARGET_MB && hashesOk;
		console.log(`\n${ok ? 'all targets met' : 'TARGET MISSED'}\n`);
		return ok;
	} finally {
		bare?.kill('SIGTERM');
		server?.kill('SIGTERM');
		await db.end().catch(() => {});
		await mail.close();
		cluster.stop();
		rmSync(work, { recursive: true, force: true });
	}
}

const ok = await main();
process.exitCode = ok ? 0 : 1;
