import { type Kysely, sql } from 'kysely';

/** Links the shoot to the rundown: which segments a shoot day films, and which footage a take is in. */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('shoot_day_segment')
		.addColumn('shoot_day_id', 'uuid', (c) =>
			c.notNull().references('shoot_day.id').onDelete('cascade')
		)
		.addColumn('segment_id', 'uuid', (c) =>
			c.notNull().references('segment.id').onDelete('cascade')
		)
		.addPrimaryKeyConstraint('shoot_day_segment_pk', ['shoot_day_id', 'segment_id'])
		.execute();
	await sql`ALTER TABLE take ADD CONSTRAINT take_footage_fk FOREIGN KEY (footage_id) REFERENCES footage(id) ON DELETE SET NULL`.execute(
		db
	);
}

export async function down(db: Kysely<any>): Promise<void> {
	await sql`ALTER TABLE take DROP CONSTRAINT IF EXISTS take_footage_fk`.execute(db);
	await db.schema.dropTable('shoot_day_segment').ifExists().execute();
}
