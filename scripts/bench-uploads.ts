/**
 * Upload benchmark (not a test): a 2 GiB file over loopback through the built server with
 * tus-js-client, against a baseline measured in the same run, a bare Node.js HTTP server that
 * streams the request body to a file on the same disk. Prints both throughputs, their ratio
 * (target ≥ 70%) and the server's peak resident memory (target < 200 MB).
 */
import { spawn } from 'node:child_process';
import {
	chmodSync,
	createReadStream,
	createWriteStream,
	mkdtempSync,
	openSync,
	readFileSync,
	rmSync,
	writeSync,
	closeSync
} from 'node:fs';
import { createServer } from 'node:http';
import { randomBytes } from 'node:crypto';
import path from 'node:path';
import { pipeline } from 'node:stream/promises';
import * as tus from 'tus-js-client';
import { startCluster } from './lib/postgres.ts';
import { startFakeMail } from './lib/fake-mail.ts';
import { projectRoot } from './lib/config.ts';
import { freePort, runScript, signInCookie, waitForHttp } from './lib/bench-world.ts';
import { BODY_SIZE_LIMIT_BYTES, UPLOAD_CHUNK_BYTES } from '../src/lib/upload-rules.ts';

const SIZE = Number(process.env.BENCH_UPLOAD_BYTES ?? 2 * 1024 ** 3);
const work = mkdtempSync(
	path.join(process.env.BENCH_DIR ?? path.join(projectRoot, '.data'), 'bench-uploads-')
);
chmodSync(work, 0o755); // the postgres OS user must reach the cluster folder inside
const buildDir = path.resolve(projectRoot, process.env.WRENCHROLL_BUILD_DIR ?? 'build');

function makeSourceFile(file: string) {
	const block = randomBytes(16 * 1024 * 1024);
	const fd = openSync(file, 'w');
	for (let written = 0; written < SIZE; written += block.length)
		writeSync(fd, block, 0, Math.min(block.length, SIZE - written));
	closeSync(fd);
}

/** Baseline: the plainest server that can store an upload, streaming the body to disk. */
async function baselineSeconds(source: string): Promise<number> {
	const target = path.join(work, 'baseline.bin');
	const server = createServer((req, res) => {
		pipeline(req, createWriteStream(target)).then(
			() => res.writeHead(204).end(),
			() => res.writeHead(500).end()
		);
	});
	await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
	const { port } = server.address() as { port: number };
	const started = performance.now();
	const { request } = await import('node:http');
	await new Promise<void>((resolve, reject) => {
		const req = request(
			{ host: '127.0.0.1', port, method: 'POST', path: '/', headers: { 'content-length': SIZE } },
			(res) => {
				res.resume();
				res.on('end', resolve);
			}
		);
		req.on('error', reject);
		createReadStream(source).pipe(req);
	});
	const seconds = (performance.now() - started) / 1000;
	server.close();
	rmSync(target, { force: true });
	return seconds;
}

function residentMegabytes(pid: number): number {
	const status = readFileSync(`/proc/${pid}/status`, 'utf8');
	return Number(/VmRSS:\s+(\d+)/.exec(status)?.[1] ?? 0) / 1024;
}

async function main() {
	console.log(
		`upload benchmark: ${(SIZE / 1024 ** 3).toFixed(2)} GiB over loopback, chunk ${UPLOAD_CHUNK_BYTES / 1024 ** 2} MiB`
	);
	const source = path.join(work, 'source.bin');
	makeSourceFile(source);
	const cluster = await startCluster({
		dataDir: path.join(work, 'pg'),
		port: await freePort(),
		database: 'bench'
	});
	const mail = await startFakeMail({ port: await freePort(), dir: path.join(work, 'mail') });
	let server: ReturnType<typeof spawn> | null = null;
	try {
		runScript('scripts/migrate.ts', cluster.url);
		runScript('scripts/seed.ts', cluster.url);
		const port = await freePort();
		const base = `http://127.0.0.1:${port}`;
		server = spawn(process.execPath, [path.join(buildDir, 'index.js')], {
			env: {
				...process.env,
				NODE_ENV: 'production',
				HOST: '127.0.0.1',
				PORT: String(port),
				ORIGIN: base,
				DATABASE_URL: cluster.url,
				SMTP_URL: mail.url,
				AUTH_SECRET: 'bench-secret-0123456789-0123456789',
				UPLOAD_DIR: path.join(work, 'uploads'),
				BODY_SIZE_LIMIT: process.env.BENCH_BODY_LIMIT ?? String(BODY_SIZE_LIMIT_BYTES)
			},
			stdio: ['ignore', 'ignore', 'inherit']
		});
		await waitForHttp(`${base}/healthz`, 30_000);
		const cookie = await signInCookie(base, 'mika@torquehaven.test');
		const episode = await (
			await fetch(`${base}/api/episodes`, { headers: { cookie } })
		)
			.json()
			.catch(() => null);
		const episodeId: string =
			episode?.episodes?.[0]?.id ??
			(await (await fetch(`${base}/api/me`, { headers: { cookie } })).json()).channel.id;

		const baseline = await baselineSeconds(source);
		let peakMb = residentMegabytes(server.pid!);
		const sampler = setInterval(
			() => (peakMb = Math.max(peakMb, residentMegabytes(server!.pid!))),
			100
		);
		const started = performance.now();
		await new Promise<void>((resolve, reject) => {
			new tus.Upload(createReadStream(source), {
				endpoint: `${base}/api/uploads`,
				chunkSize: Number(process.env.BENCH_CHUNK ?? UPLOAD_CHUNK_BYTES),
				headers: { cookie, origin: base },
				metadata: { filename: 'bench.mp4', filetype: 'video/mp4', episodeId },
				onError: reject,
				onSuccess: () => resolve()
			}).start();
		});
		const seconds = (performance.now() - started) / 1000;
		clearInterval(sampler);
		const mbps = (s: number) => SIZE / 1e6 / s;
		const ratio = baseline / seconds;
		console.log(
			`baseline (bare Node.js, one streamed POST): ${mbps(baseline).toFixed(0)} MB/s in ${baseline.toFixed(2)} s`
		);
		console.log(
			`Wrenchroll (tus, incl. SHA-256 on completion): ${mbps(seconds).toFixed(0)} MB/s in ${seconds.toFixed(2)} s`
		);
		console.log(
			`ratio: ${(ratio * 100).toFixed(0)}% of baseline (target ≥ 70%) ${ratio >= 0.7 ? 'PASS' : 'FAIL'}`
		);
		console.log(
			`server peak resident memory: ${peakMb.toFixed(0)} MB (target < 200 MB) ${peakMb < 200 ? 'PASS' : 'FAIL'}`
		);
		return ratio >= 0.7 && peakMb < 200;
	} finally {
		server?.kill('SIGTERM');
		await mail.close();
		cluster.stop();
		rmSync(work, { recursive: true, force: true });
	}
}

const ok = await main();
process.exitCode = ok ? 0 : 1;
