/**
 * A database of a test's own on the test cluster, for a second server whose data must not mix with
 * the shared demo database: created empty, then filled by the project's own scripts (migrate, seed).
 */
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import pg from 'pg';
import { expect, inject } from 'vitest';

const root = path.resolve(import.meta.dirname, '../..');

async function onCluster(statement: string): Promise<void> {
	const admin = new pg.Client({ connectionString: inject('databaseUrl') });
	await admin.connect();
	try {
		await admin.query(statement);
	} finally {
		await admin.end();
	}
}

/** Creates `name` afresh, runs each script against it and returns its connection URL. */
export async function scratchDatabase(name: string, scripts: string[]): Promise<string> {
	await onCluster(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
	await onCluster(`CREATE DATABASE ${name}`);
	const url = new URL(inject('databaseUrl'));
	url.pathname = `/${name}`;
	const databaseUrl = url.toString();
	for (const script of scripts) {
		const result = spawnSync(path.join(root, 'node_modules/.bin/tsx'), [script], {
			cwd: root,
			env: { ...process.env, DATABASE_URL: databaseUrl },
			encoding: 'utf8'
		});
		expect(result.status, result.stderr).toBe(0);
	}
	return databaseUrl;
}

export const dropScratchDatabase = (name: string) =>
	onCluster(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
