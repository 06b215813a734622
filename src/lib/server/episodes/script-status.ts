/**
 * The one place the server decides whether an approved script changed since approval: in SQL, so
 * the episode list, the overview, the script page, the home worklist and the gate read the same
 * answer in the query they already run. The fingerprint of the script as saved now is a column of
 * the episode (`script_fingerprint`) that the database keeps true itself: triggers recompute it
 * whenever a script's text or a segment's place changes
 * (migrations/2026-12-04-30-stored-script-fingerprint.ts), over the bytes fingerprint.ts hashes
 * (each segment's id, NUL, its text, SOH, in rundown order). So a read compares two columns
 * instead of hashing every script it shows.
 */
import { sql, type RawBuilder } from 'kysely';

/** SQL over a query with `episode` in scope: approved, and the text changed since. */
export function scriptChangedSinceApproval(): RawBuilder<boolean> {
	return sql<boolean>`(episode.script_status = 'approved' AND episode.script_approved_fingerprint IS DISTINCT FROM episode.script_fingerprint)`;
}
