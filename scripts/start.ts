/**
 * npm start: the whole product on one machine. Installs the Debian packages it needs when they are
 * missing (scripts/lib/system-packages.sh); uses DATABASE_URL when set, else the embedded
 * PostgreSQL cluster under .data/postgres; migrates; writes the demo data into an empty database;
 * runs the loopback fake mail server unless SMTP_URL is set, with the dev mailbox (DEV_MAILBOX=1)
 * for a server on loopback; then serves the built app.
 */
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import path from 'node:path';
import { migrateToLatest } from './lib/migrator.ts';
import { startCluster, type Cluster } from './lib/postgres.ts';
import { seedDemo } from './lib/seed.ts';
import { startFakeMail, type FakeMail } from './lib/fake-mail.ts';
import { demoMailbox } from './lib/dev-mailbox.ts';
import { serverProcessArgs } from './lib/server-entry.ts';
import { BODY_SIZE_LIMIT_BYTES } from '../src/lib/upload-rules.ts';
import { EMBEDDED_DATABASE, EMBEDDED_PG_DIR, EMBEDDED_PG_PORT, projectRoot } from './lib/config.ts';

// PostgreSQL for the embedded cluster (not needed with DATABASE_URL); ffmpeg because the server
// reads uploaded footage with ffprobe. The shared check installs them as root or says how.
const systemPackages = process.env.DATABASE_URL ? ['ffmpeg'] : ['postgresql', 'ffmpeg'];
const packageCheck = spawnSync(
	'bash',
	[path.join(projectRoot, 'scripts/lib/system-packages.sh'), 'npm start', ...systemPackages],
	{ stdio: 'inherit' }
);
if (packageCheck.status !== 0) process.exit(packageCheck.status ?? 1);

const host = process.env.HOST ?? '127.0.0.1';
const port = Number(process.env.PORT ?? 3100);
const origin = process.env.ORIGIN ?? `http://${host}:${port}`;
const dataDir = path.join(projectRoot, '.data');
mkdirSync(dataDir, { recursive: true });

let cluster: Cluster | null = null;
let fakeMail: FakeMail | null = null;

function fail(message: string): never {
	console.error(`\nWrenchroll could not start: ${message}\n`);
	cluster?.stop();
	process.exit(1);
}

let databaseUrl = process.env.DATABASE_URL;
if (!databaseUrl) {
	try {
		cluster = await startCluster({
			dataDir: EMBEDDED_PG_DIR,
			port: EMBEDDED_PG_PORT,
			database: EMBEDDED_DATABASE
		});
	} catch (failure) {
		fail(failure instanceof Error ? failure.message : String(failure));
	}
	databaseUrl = cluster.url;
	console.log(
		`database: embedded PostgreSQL on 127.0.0.1:${EMBEDDED_PG_PORT} (data in .data/postgres)`
	);
}
await migrateToLatest(databaseUrl, (line) => console.log(line));
if ((await seedDemo(databaseUrl)) === 'seeded')
	console.log('demo data written (see README for the demo logins)');

const env: Record<string, string> = {
	...(process.env as Record<string, string>),
	DATABASE_URL: databaseUrl,
	HOST: host,
	PORT: String(port),
	ORIGIN: origin,
	// Production mode for the libraries that read it (SvelteKit's server output, Auth.js's logging).
	NODE_ENV: 'production',
	// The demo makes proxies, thumbnails and waveforms in the app process; a deployment runs
	// `npm run worker` beside it instead (set WRENCHROLL_MEDIA_WORKER=off here then).
	WRENCHROLL_MEDIA_WORKER: process.env.WRENCHROLL_MEDIA_WORKER ?? 'inline'
};
const mailSetting = demoMailbox(env);
delete env.DEV_MAILBOX;
if (mailSetting.fakeMail) {
	const mailPort = Number(process.env.FAKE_SMTP_PORT ?? 2526);
	const mailbox = path.join(dataDir, 'mail');
	fakeMail = await startFakeMail({ port: mailPort, dir: mailbox });
	env.SMTP_URL = fakeMail.url;
	env.DEV_MAILBOX_DIR = mailbox;
	if (mailSetting.mailbox) {
		env.DEV_MAILBOX = '1';
		console.log(`mail: fake mail server on 127.0.0.1:${mailPort}; read it at ${origin}/dev/mail`);
	} else {
		console.log(
			`mail: fake mail server on 127.0.0.1:${mailPort}; the dev mailbox is off (set DEV_MAILBOX=1 to read it at ${origin}/dev/mail)`
		);
	}
}
if (!env.AUTH_SECRET) {
	// For the local demo only: a secret kept under .data so sessions survive a restart.
	const secretFile = path.join(dataDir, 'auth-secret');
	if (!existsSync(secretFile))
		writeFileSync(secretFile, randomBytes(32).toString('base64url'), { mode: 0o600 });
	env.AUTH_SECRET = readFileSync(secretFile, 'utf8').trim();
}
env.UPLOAD_DIR ??= path.join(projectRoot, 'uploads');
env.BODY_SIZE_LIMIT ??= String(BODY_SIZE_LIMIT_BYTES);

if (!existsSync(path.join(projectRoot, 'build', 'index.js'))) {
	console.log('building the app (first start)…');
	const built = spawnSync(
		process.execPath,
		[path.join(projectRoot, 'node_modules/vite/bin/vite.js'), 'build'],
		{ stdio: 'inherit', cwd: projectRoot }
	);
	if (built.status !== 0) fail('the build failed (see above).');
}

const server = spawn(process.execPath, serverProcessArgs(path.join(projectRoot, 'build')), {
	env,
	stdio: ['ignore', 'inherit', 'inherit']
});
console.log(`\nWrenchroll is serving ${origin}\n`);

let stopping = false;
async function stop(code = 0) {
	if (stopping) return;
	stopping = true;
	server.kill('SIGTERM');
	await fakeMail?.close();
	if (cluster?.startedHere) cluster.stop(); // the data stays in .data/postgres for the next start
	process.exit(code);
}
process.on('SIGINT', () => void stop(0));
process.on('SIGTERM', () => void stop(0));
server.on('exit', (code) => void stop(code ?? 1));
