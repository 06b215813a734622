import { type Kysely, sql } from 'kysely';

/**
 * An episode's programme timecode: drop-frame or non-drop, and the label of the cut's first frame.
 *
 * - `timecode_drop_frame`: null keeps the rate's usual form (drop-frame at 29.97 and 59.94, as
 *   before); true is only allowed where drop-frame exists (SMPTE ST 12-1: 29.97 and 59.94).
 * - `timecode_start`: the first frame's label as HH:MM:SS:FF with a colon (the form says how it
 *   reads), 00:00:00:00 to 23:59:59:59; whether the frames fit the rate is checked by the app.
 *
 * Positions stay frame counts from the start of the cut, so no stored frame changes.
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('episode')
		.addColumn('timecode_drop_frame', 'boolean')
		.addColumn('timecode_start', 'text', (c) =>
			c
				.notNull()
				.defaultTo('00:00:00:00')
				.check(sql`timecode_start ~ '^([01][0-9]|2[0-3]):[0-5][0-9]:[0-5][0-9]:[0-5][0-9]$'`)
		)
		.execute();
	await sql`ALTER TABLE episode ADD CONSTRAINT episode_timecode_drop_frame_rate
		CHECK (timecode_drop_frame IS NOT TRUE OR frame_rate IN ('29.97', '59.94'))`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
	await sql`ALTER TABLE episode DROP CONSTRAINT IF EXISTS episode_timecode_drop_frame_rate`.execute(
		db
	);
	await db.schema
		.alterTable('episode')
		.dropColumn('timecode_start')
		.dropColumn('timecode_drop_frame')
		.execute();
}
