import { type Kysely, sql } from 'kysely';

/**
 * A chapter's `part_id` now references a part: a chapter can name the part it is about, that part
 * must exist, and removing the part from the catalogue clears the link (the chapter stays). Links
 * that name no part, or a part of another channel, are cleared first. Frozen in time: it imports
 * no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await sql`
		UPDATE chapter SET part_id = NULL
		WHERE part_id IS NOT NULL AND NOT EXISTS (
			SELECT 1 FROM part JOIN episode ON episode.channel_id = part.channel_id
			WHERE part.id = chapter.part_id AND episode.id = chapter.episode_id
		)`.execute(db);
	await sql`ALTER TABLE chapter ADD CONSTRAINT chapter_part_fk FOREIGN KEY (part_id) REFERENCES part (id) ON DELETE SET NULL`.execute(
		db
	);
	await db.schema
		.createIndex('chapter_part')
		.on('chapter')
		.column('part_id')
		.where(sql.ref('part_id'), 'is not', null)
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropIndex('chapter_part').ifExists().execute();
	await sql`ALTER TABLE chapter DROP CONSTRAINT IF EXISTS chapter_part_fk`.execute(db);
}
