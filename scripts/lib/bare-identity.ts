/**
 * The bare baselines' sign-in read (scripts/lib/bare-*-server.ts): who is calling, by session id,
 * with their channels and roles, in one query, as the app's session lookup reads it.
 */
export const IDENTITY = `SELECT p.id AS person_id, p.email, p.name AS person_name, p.last_channel_id, c.id, c.name, c.frame_rate, m.roles
FROM person_session s JOIN person p ON p.id = s.person_id JOIN membership m ON m.person_id = p.id
JOIN channel c ON c.id = m.channel_id
WHERE s.id = $1 AND s.expires_at > now() AND m.disabled_at IS NULL ORDER BY c.name`;
