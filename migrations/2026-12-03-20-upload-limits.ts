import { type Kysely, sql } from 'kysely';

/**
 * Upload limits. Each channel gets a storage quota in whole decimal gigabytes (default 2,000 GB =
 * 2 TB), which finished footage and the declared lengths of unfinished uploads count against. An
 * upload's size may now be unknown (NULL) until it finishes, for uploads created with tus's
 * Upload-Defer-Length. Indexes serve the quota sum and the lookups of unfinished uploads.
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('channel')
		.addColumn('storage_quota_gb', 'integer', (c) =>
			c
				.notNull()
				.defaultTo(2000)
				.check(sql`storage_quota_gb BETWEEN 1 AND 1000000`)
		)
		.execute();
	await sql`ALTER TABLE upload ALTER COLUMN size_bytes DROP NOT NULL`.execute(db);
	await db.schema.createIndex('footage_channel').on('footage').column('channel_id').execute();
	await sql`CREATE INDEX upload_unfinished ON upload (created_at) WHERE completed_at IS NULL`.execute(
		db
	);
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropIndex('upload_unfinished').ifExists().execute();
	await db.schema.dropIndex('footage_channel').ifExists().execute();
	await sql`UPDATE upload SET size_bytes = 0 WHERE size_bytes IS NULL`.execute(db);
	await sql`ALTER TABLE upload ALTER COLUMN size_bytes SET NOT NULL`.execute(db);
	await db.schema.alterTable('channel').dropColumn('storage_quota_gb').execute();
}
