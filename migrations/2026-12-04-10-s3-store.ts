import { sql, type Kysely } from 'kysely';

/**
 * Where a clip's bytes live: `disk` (the server's upload folder, as before) or `bucket` (object
 * storage through the S3 API). The clip's proxy, poster, sprite and peaks live in the same place.
 * Every row written before this lived on disk.
 *
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('footage')
		.addColumn('stored_in', 'text', (c) =>
			c
				.notNull()
				.defaultTo('disk')
				.check(sql`stored_in IN ('disk', 'bucket')`)
		)
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('footage').dropColumn('stored_in').execute();
}
