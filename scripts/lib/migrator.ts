/** Runs the migrations in migrations/ with Kysely's Migrator and fails loudly on error. */
import { promises as fs } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { FileMigrationProvider, Kysely, Migrator, PostgresDialect } from 'kysely';
import pg from 'pg';

const migrationFolder = path.resolve(
	path.dirname(fileURLToPath(import.meta.url)),
	'../../migrations'
);

export async function migrateToLatest(
	databaseUrl: string,
	log: (line: string) => void = console.log
): Promise<void> {
	const db = new Kysely<any>({
		dialect: new PostgresDialect({ pool: new pg.Pool({ connectionString: databaseUrl, max: 1 }) })
	});
	try {
		const migrator = new Migrator({
			db,
			provider: new FileMigrationProvider({ fs, path, migrationFolder })
		});
		const { error, results } = await migrator.migrateToLatest();
		for (const result of results ?? []) {
			if (result.status === 'Success') log(`migrated: ${result.migrationName}`);
			else if (result.status === 'Error') log(`migration failed: ${result.migrationName}`);
		}
		if (error) throw error instanceof Error ? error : new Error(String(error));
	} finally {
		await db.destroy();
	}
}
