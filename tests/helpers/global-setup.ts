/**
 * One throwaway world for the integration and browser tests: a PostgreSQL cluster on a free
 * loopback port, migrated and seeded with the real scripts; the loopback fake mail server; and the
 * built server started as in production (server.js around the build in WRENCHROLL_BUILD_DIR or
 * build/). Torn down after the run.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, chmodSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { startCluster } from '../../scripts/lib/postgres';
import { startFakeMail } from '../../scripts/lib/fake-mail';
import { serverProcessArgs } from '../../scripts/lib/server-entry';
import { freePort, waitForHttp } from './net';
import { BODY_SIZE_LIMIT_BYTES } from '../../src/lib/upload-rules';

const root = path.resolve(import.meta.dirname, '../..');
const buildDir = path.resolve(root, process.env.WRENCHROLL_BUILD_DIR ?? 'build');

declare module 'vitest' {
	export interface ProvidedContext {
		baseUrl: string;
		databaseUrl: string;
		mailboxDir: string;
		uploadDir: string;
		serverEnv: Record<string, string>;
	}
}

export default async function setup(project: TestProject) {
	if (!existsSync(path.join(buildDir, 'index.js')))
		throw new Error('Build the app first: npm run build (npm test does it for you).');
	const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-test-'));
	chmodSync(work, 0o755);
	const cluster = await startCluster({
		dataDir: path.join(work, 'pg'),
		port: await freePort(),
		database: 'wrenchroll_test'
	});
	const tsx = path.join(root, 'node_modules/.bin/tsx');
	for (const script of ['scripts/migrate.ts', 'scripts/seed.ts']) {
		const result = spawnSync(tsx, [script], {
			cwd: root,
			env: { ...process.env, DATABASE_URL: cluster.url },
			encoding: 'utf8'
		});
		if (result.status !== 0)
			throw new Error(`${script} failed:\n${result.stdout}\n${result.stderr}`);
	}
	const mailboxDir = path.join(work, 'mail');
	const mail = await startFakeMail({ port: await freePort(), dir: mailboxDir });
	const port = await freePort();
	const baseUrl = `http://127.0.0.1:${port}`;
	const uploadDir = path.join(work, 'uploads');
	const serverEnv: Record<string, string> = {
		...(process.env as Record<string, string>),
		NODE_ENV: 'production',
		HOST: '127.0.0.1',
		PORT: String(port),
		ORIGIN: baseUrl,
		DATABASE_URL: cluster.url,
		SMTP_URL: mail.url,
		DEV_MAILBOX_DIR: mailboxDir,
		DEV_MAILBOX: '1',
		AUTH_SECRET: 'test-secret-for-the-throwaway-server-only-0123456789',
		UPLOAD_DIR: uploadDir,
		MAIL_INTERVAL_MS: '500',
		WRENCHROLL_MEDIA_WORKER: 'inline',
		WRENCHROLL_MEDIA_STALE_SECONDS: '6',
		BODY_SIZE_LIMIT: String(BODY_SIZE_LIMIT_BYTES)
	};
	const server: ChildProcess = startServer(serverEnv);
	await waitForHttp(`${baseUrl}/healthz`, 30_000);

	project.provide('baseUrl', baseUrl);
	project.provide('databaseUrl', cluster.url);
	project.provide('mailboxDir', mailboxDir);
	project.provide('uploadDir', uploadDir);
	project.provide('serverEnv', serverEnv);

	return async () => {
		await stopServer(server);
		await mail.close();
		cluster.stop();
		rmSync(work, { recursive: true, force: true });
	};
}

export function stopServer(child: ChildProcess): Promise<void> {
	if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
	return new Promise((resolve) => {
		const force = setTimeout(() => child.kill('SIGKILL'), 10_000);
		child.once('exit', () => {
			clearTimeout(force);
			resolve();
		});
		child.kill('SIGTERM');
	});
}

export function startServer(env: Record<string, string>): ChildProcess {
	const child = spawn(process.execPath, serverProcessArgs(buildDir), {
		env,
		stdio: ['ignore', 'ignore', 'inherit']
	});
	return child;
}
