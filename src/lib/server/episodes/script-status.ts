/**
 * The one place the server decides whether an approved script changed since approval: in SQL, so
 * the episode list, the overview, the script page, the home worklist and the gate read the same
 * answer in the query they already run. The fingerprint is the bytes fingerprint.ts hashes (each
 * segment's id, NUL, its text, SOH, in rundown order), hashed by the database's sha256().
 */
import { sql, type Expression, type RawBuilder } from 'kysely';

/** SQL: the fingerprint of the script of the episode `episodeId` names, as saved now. */
export function scriptFingerprintOf(episodeId: Expression<string>): RawBuilder<string> {
	return sql<string>`(
		SELECT encode(sha256(coalesce(string_agg(
			convert_to(fp_segment.id::text, 'UTF8') || decode('00', 'hex')
				|| convert_to(fp_script.body, 'UTF8') || decode('01', 'hex'),
			''::bytea ORDER BY fp_segment.position), ''::bytea)), 'hex')
		FROM segment fp_segment
		JOIN segment_script fp_script ON fp_script.segment_id = fp_segment.id
		WHERE fp_segment.episode_id = ${episodeId}
	)`;
}

/** SQL over a query with `episode` in scope: approved, and the text changed since. */
export function scriptChangedSinceApproval(): RawBuilder<boolean> {
	return sql<boolean>`(episode.script_status = 'approved' AND episode.script_approved_fingerprint IS DISTINCT FROM ${scriptFingerprintOf(sql.ref('episode.id'))})`;
}
