import { type Kysely, sql } from 'kysely';

/**
 * Cautions tied to their hazard: each rundown segment gets its in and out points on the edit
 * timeline (programme frames at the episode's rate, out exclusive; both null until the editor
 * places the segment), and each caution card its time on screen (frames; null until set). The lock
 * gate asks for every caution of a flagged segment inside that segment's span, on screen long
 * enough to be read.
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('segment')
		.addColumn('cut_in_frame', 'integer')
		.addColumn('cut_out_frame', 'integer')
		.execute();
	await sql`ALTER TABLE segment ADD CONSTRAINT segment_cut_span CHECK (
		(cut_in_frame IS NULL AND cut_out_frame IS NULL)
		OR (cut_in_frame >= 0 AND cut_out_frame > cut_in_frame)
	)`.execute(db);
	await db.schema
		.alterTable('caution')
		.addColumn('duration_frames', 'integer', (c) => c.check(sql`duration_frames > 0`))
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('caution').dropColumn('duration_frames').execute();
	await sql`ALTER TABLE segment DROP CONSTRAINT IF EXISTS segment_cut_span`.execute(db);
	await db.schema
		.alterTable('segment')
		.dropColumn('cut_in_frame')
		.dropColumn('cut_out_frame')
		.execute();
}
