import { type Kysely, type RawBuilder, sql } from 'kysely';

/**
 * Frame rates the database itself refuses, and an index under every foreign key a query or a
 * cascade walks.
 *
 * - `channel`, `episode` and `recording_profile` hold a rate someone picked: a CHECK allows only
 *   the programme rates the app offers (the FrameRate type of $lib/timecode, copied here).
 * - `footage.frame_rate` is what ffprobe measured in the uploaded file, so a 120 fps slow-motion
 *   clip is a true value: its CHECK only asks for the decimal label the probe writes ("29.97",
 *   "120"), or null when nothing was read.
 * - A stored value that breaks a CHECK stops the migration with the rows named. It is not rewritten:
 *   an episode's chapters, cautions, cards and notes are frame counts at its rate, so guessing a
 *   rate would silently move every one of them. Fix those rows by hand, then migrate again.
 * - Indexes: deleting a parent row makes PostgreSQL look for its children (ON DELETE CASCADE, SET
 *   NULL and the plain check alike), and a few pages filter by these columns; without an index
 *   each such look is a scan of the whole child table.
 *
 * Frozen in time: it imports no app code.
 */
const PROGRAMME_RATES = ['23.976', '24', '25', '29.97', '30', '50', '59.94', '60'];
const CHOSEN_RATE_TABLES = ['channel', 'episode', 'recording_profile'];
/** A positive decimal with up to three places, as the probe writes it. */
const MEASURED_RATE = '^[0-9]+(\\.[0-9]{1,3})?$';

/** [index, table, column] */
const INDEXES: [string, string, string][] = [
	// Deleting a shoot day cascades to these, and its page reads them by day.
	['gear_item_shoot_day', 'gear_item', 'shoot_day_id'],
	['pull_item_shoot_day', 'pull_item', 'shoot_day_id'],
	['shoot_day_camera_shoot_day', 'shoot_day_camera', 'shoot_day_id'],
	// Deleting a shoot day clears these links (SET NULL); the footage page filters by day.
	['footage_shoot_day', 'footage', 'shoot_day_id'],
	['upload_shoot_day', 'upload', 'shoot_day_id'],
	// An episode's shoot days (the shoot day form's choices, the episode's shoot list).
	['shoot_day_episode', 'shoot_day', 'episode_id'],
	// Deleting a segment clears its notes' link and cascades to reviews and shoot-day links; the
	// primary keys of the latter lead with another column, so they don't serve this look-up.
	['segment_note_segment', 'segment_note', 'segment_id'],
	['script_review_segment', 'script_review', 'segment_id'],
	['shoot_day_segment_segment', 'shoot_day_segment', 'segment_id'],
	// "Is this profile in use?" before a profile is deleted, and the foreign key's own check.
	['shoot_day_camera_profile', 'shoot_day_camera', 'profile_id'],
	// Deleting a part clears it from pull lists (SET NULL).
	['pull_item_part', 'pull_item', 'part_id'],
	// Deleting footage clears it from takes (SET NULL).
	['take_footage', 'take', 'footage_id'],
	// A build's sheet lists its episodes, and the builds list counts them.
	['episode_build_build', 'episode_build', 'build_id'],
	// The recording profiles page lists a channel's profiles.
	['recording_profile_channel', 'recording_profile', 'channel_id']
];

const textList = (values: string[]) => sql.join(values.map((value) => sql.lit(value)));

async function refuseBadRows(db: Kysely<any>, table: string, allowed: RawBuilder<unknown>) {
	const { rows } = await sql<{ id: string; frameRate: string }>`
		SELECT id, frame_rate AS "frameRate" FROM ${sql.table(table)}
		WHERE frame_rate IS NOT NULL AND NOT (${allowed}) LIMIT 20`.execute(db);
	if (rows.length === 0) return;
	const list = rows.map((row) => `${row.id} (${JSON.stringify(row.frameRate)})`).join(', ');
	throw new Error(
		`${table}.frame_rate holds values the new check refuses: ${list}. Set each to one of ` +
			`${PROGRAMME_RATES.join(', ')}${table === 'footage' ? ' or a measured rate like 120, or NULL' : ''}, then migrate again.`
	);
}

export async function up(db: Kysely<any>): Promise<void> {
	for (const table of CHOSEN_RATE_TABLES) {
		const allowed = sql`frame_rate IN (${textList(PROGRAMME_RATES)})`;
		await refuseBadRows(db, table, allowed);
		await sql`ALTER TABLE ${sql.table(table)} ADD CONSTRAINT ${sql.id(`${table}_frame_rate_known`)} CHECK (${allowed})`.execute(
			db
		);
	}
	const measured = sql`frame_rate ~ ${sql.lit(MEASURED_RATE)}`;
	await refuseBadRows(db, 'footage', measured);
	await sql`ALTER TABLE footage ADD CONSTRAINT footage_frame_rate_measured CHECK (frame_rate IS NULL OR ${measured})`.execute(
		db
	);

	for (const [index, table, column] of INDEXES) {
		await db.schema.createIndex(index).on(table).column(column).execute();
	}
}

export async function down(db: Kysely<any>): Promise<void> {
	for (const [index] of [...INDEXES].reverse()) {
		await db.schema.dropIndex(index).ifExists().execute();
	}
	await sql`ALTER TABLE footage DROP CONSTRAINT IF EXISTS footage_frame_rate_measured`.execute(db);
	for (const table of [...CHOSEN_RATE_TABLES].reverse()) {
		await sql`ALTER TABLE ${sql.table(table)} DROP CONSTRAINT IF EXISTS ${sql.id(`${table}_frame_rate_known`)}`.execute(
			db
		);
	}
}
