import { type Kysely, sql } from 'kysely';

/**
 * Each episode keeps the fingerprint of its script as saved now (`episode.script_fingerprint`),
 * kept true by the database itself: triggers on `segment` and `segment_script` recompute it at the
 * end of every statement that changes a script's text, a segment's place in the rundown or which
 * episode it belongs to. Before this, every read that showed "changed since approval" (the episode
 * list, the home page, the episode page and API) hashed the whole script of every episode it read;
 * at 50 approved episodes a page that was about half of the list query's time.
 *
 * The fingerprint is the one the app has always used (src/lib/server/episodes/fingerprint.ts):
 * SHA-256 over, for each segment that has a script row, in rundown order, the segment's id, a zero
 * byte, the text in UTF-8 and a one byte; with no such segment, the SHA-256 of nothing.
 *
 * Every write to an episode's work locks the episode row first (stage-locks.ts), so the triggers'
 * update of that row adds no new lock order. Statement-level triggers with transition tables: a
 * reorder of fifty segments hashes the script once, not fifty times.
 *
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('episode')
		.addColumn('script_fingerprint', 'text', (c) =>
			c.notNull().defaultTo(sql`encode(sha256(''::bytea), 'hex')`)
		)
		.execute();
	await sql`
		CREATE FUNCTION episode_script_fingerprint(target uuid) RETURNS text
		LANGUAGE sql VOLATILE AS $$
			SELECT encode(sha256(coalesce(string_agg(
				convert_to(fp_segment.id::text, 'UTF8') || decode('00', 'hex')
					|| convert_to(fp_script.body, 'UTF8') || decode('01', 'hex'),
				''::bytea ORDER BY fp_segment.position), ''::bytea)), 'hex')
			FROM segment fp_segment
			JOIN segment_script fp_script ON fp_script.segment_id = fp_segment.id
			WHERE fp_segment.episode_id = target
		$$`.execute(db);

	await sql`
		CREATE FUNCTION refresh_script_fingerprints(targets uuid[]) RETURNS void
		LANGUAGE sql VOLATILE AS $$
			UPDATE episode
			SET script_fingerprint = fresh.fingerprint
			FROM (
				SELECT target, episode_script_fingerprint(target) AS fingerprint
				FROM unnest(targets) AS target
			) AS fresh
			WHERE episode.id = fresh.target
				AND episode.script_fingerprint IS DISTINCT FROM fresh.fingerprint
		$$`.execute(db);

	await sql`UPDATE episode SET script_fingerprint = episode_script_fingerprint(id)`.execute(db);

	// A segment's id, place or episode changed, or segments were deleted (their script rows go with
	// them, and by the time this runs those rows can no longer name their episode). A new segment has
	// no script row yet, so inserting one changes nothing.
	await sql`
		CREATE FUNCTION segment_moved_fingerprint() RETURNS trigger
		LANGUAGE plpgsql AS $$
		BEGIN
			IF TG_OP = 'DELETE' THEN
				PERFORM refresh_script_fingerprints(ARRAY(SELECT DISTINCT episode_id FROM old_rows));
			ELSE
				PERFORM refresh_script_fingerprints(ARRAY(
					SELECT episode_id FROM (
						(SELECT id, episode_id, position FROM new_rows
							EXCEPT SELECT id, episode_id, position FROM old_rows)
						UNION
						(SELECT id, episode_id, position FROM old_rows
							EXCEPT SELECT id, episode_id, position FROM new_rows)
					) AS changed
				));
			END IF;
			RETURN NULL;
		END
		$$`.execute(db);
	await sql`
		CREATE TRIGGER segment_fingerprint_update AFTER UPDATE ON segment
		REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
		FOR EACH STATEMENT EXECUTE FUNCTION segment_moved_fingerprint()`.execute(db);
	await sql`
		CREATE TRIGGER segment_fingerprint_delete AFTER DELETE ON segment
		REFERENCING OLD TABLE AS old_rows
		FOR EACH STATEMENT EXECUTE FUNCTION segment_moved_fingerprint()`.execute(db);

	// A script's text written, added or removed: the episodes of the segments named.
	await sql`
		CREATE FUNCTION segment_script_fingerprint() RETURNS trigger
		LANGUAGE plpgsql AS $$
		BEGIN
			IF TG_OP = 'INSERT' THEN
				PERFORM refresh_script_fingerprints(ARRAY(
					SELECT DISTINCT segment.episode_id FROM new_rows
					JOIN segment ON segment.id = new_rows.segment_id));
			ELSIF TG_OP = 'DELETE' THEN
				PERFORM refresh_script_fingerprints(ARRAY(
					SELECT DISTINCT segment.episode_id FROM old_rows
					JOIN segment ON segment.id = old_rows.segment_id));
			ELSE
				PERFORM refresh_script_fingerprints(ARRAY(
					SELECT DISTINCT segment.episode_id FROM (
						(SELECT segment_id, body FROM new_rows EXCEPT SELECT segment_id, body FROM old_rows)
						UNION
						(SELECT segment_id, body FROM old_rows EXCEPT SELECT segment_id, body FROM new_rows)
					) AS changed
					JOIN segment ON segment.id = changed.segment_id));
			END IF;
			RETURN NULL;
		END
		$$`.execute(db);
	for (const [event, tables] of [
		['INSERT', 'NEW TABLE AS new_rows'],
		['UPDATE', 'OLD TABLE AS old_rows NEW TABLE AS new_rows'],
		['DELETE', 'OLD TABLE AS old_rows']
	] as const)
		await sql`
			CREATE TRIGGER ${sql.id(`segment_script_fingerprint_${event.toLowerCase()}`)}
			AFTER ${sql.raw(event)} ON segment_script
			REFERENCING ${sql.raw(tables)}
			FOR EACH STATEMENT EXECUTE FUNCTION segment_script_fingerprint()`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
	for (const event of ['insert', 'update', 'delete'])
		await sql`DROP TRIGGER IF EXISTS ${sql.id(`segment_script_fingerprint_${event}`)} ON segment_script`.execute(
			db
		);
	await sql`DROP TRIGGER IF EXISTS segment_fingerprint_update ON segment`.execute(db);
	await sql`DROP TRIGGER IF EXISTS segment_fingerprint_delete ON segment`.execute(db);
	await sql`DROP FUNCTION IF EXISTS segment_script_fingerprint()`.execute(db);
	await sql`DROP FUNCTION IF EXISTS segment_moved_fingerprint()`.execute(db);
	await db.schema.alterTable('episode').dropColumn('script_fingerprint').execute();
	await sql`DROP FUNCTION IF EXISTS refresh_script_fingerprints(uuid[])`.execute(db);
	await sql`DROP FUNCTION IF EXISTS episode_script_fingerprint(uuid)`.execute(db);
}
