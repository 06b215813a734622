import type { Kysely } from 'kysely';

/** Whether a take's source timecode was drop-frame (typed with ';'), so it reads back as the camera showed it. */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('take')
		.addColumn('source_drop_frame', 'boolean', (c) => c.notNull().defaultTo(false))
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('take').dropColumn('source_drop_frame').execute();
}
