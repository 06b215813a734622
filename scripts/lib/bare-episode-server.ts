/**
 * The bench's baseline for the episode page and API (scripts/bench-episode.ts): a bare node:http
 * server with a pg pool of the app's size, running the same reads as the app for one request and
 * answering them as JSON: who is calling (by session id), the episode with its crew and builds,
 * everything its gate reads, and for /page also the stage history and the producer's form choices
 * (builds and crew).
 * No framework, no rendering, no gate computation: what the data alone costs.
 *
 * With BARE_NAMED=1 every statement goes out named (`{ name, text, values }`), parsed and planned
 * once per connection, as the app sends the reads it compiles once
 * (src/lib/server/db/prepared-statements.ts): the baseline the bench judges against. Without it
 * the SQL goes out unnamed, as node-postgres does by default, and PostgreSQL parses and plans each
 * statement on every run: the bench's reference.
 *
 *   DATABASE_URL=… PORT=… [BARE_NAMED=1] tsx scripts/lib/bare-episode-server.ts
 *   GET /api?session=<id>&episode=<id>   GET /page?session=<id>&episode=<id>
 */
import { createServer } from 'node:http';
import pg from 'pg';
import { IDENTITY } from './bare-identity.ts';

const pool = new pg.Pool({ connectionString: process.env.DATABASE_URL, max: 10 });
const named = process.env.BARE_NAMED === '1';
const run = (name: string, text: string, values: unknown[]) =>
	named ? pool.query({ name, text, values }) : pool.query(text, values);

const agg = (select: string) => `(SELECT coalesce(json_agg(agg), '[]') FROM (${select}) AS agg)`;

const DETAIL = `SELECT e.id, e.title, e.slug, e.logline, e.target_runtime_seconds, e.frame_rate, e.publish_date, e.stage,
  e.cut_duration_frames, e.script_status, e.script_approved_fingerprint, e.script_approved_at,
  approver.name AS script_approved_by_name, e.version, e.created_at,
  ${agg(`SELECT ea.role, p.id AS person_id, p.name, p.email FROM episode_assignment ea JOIN person p ON p.id = ea.person_id WHERE ea.episode_id = e.id ORDER BY ea.role`)} AS assignments,
  ${agg(`SELECT b.id, b.name, b.year, b.vehicle_type FROM episode_build eb JOIN build b ON b.id = eb.build_id WHERE eb.episode_id = e.id ORDER BY b.name`)} AS builds
FROM episode e LEFT JOIN person approver ON approver.id = e.script_approved_by
WHERE e.id = $1 AND e.channel_id = $2`;

const MATERIALS = `SELECT e.id, e.title, e.stage, e.frame_rate, e.cut_duration_frames, e.publish_date, e.script_status,
  e.script_approved_fingerprint, c.disclosure,
  ${agg(`SELECT ea.role, ea.person_id, p.name FROM episode_assignment ea JOIN person p ON p.id = ea.person_id WHERE ea.episode_id = e.id`)} AS assignments,
  ${agg(`SELECT s.id, s.position, s.title, s.needs_footage, s.hazards, ss.body FROM segment s JOIN segment_script ss ON ss.segment_id = s.id WHERE s.episode_id = e.id ORDER BY s.position`)} AS segments,
  ${agg(`SELECT ca.segment_id, ca.hazard, ca.text, ca.at_frame FROM caution ca JOIN segment s ON s.id = ca.segment_id WHERE s.episode_id = e.id`)} AS cautions,
  ${agg(`SELECT sh.id, sh.segment_id, sh.what FROM shot sh JOIN segment s ON s.id = sh.segment_id WHERE s.episode_id = e.id ORDER BY sh.position`)} AS shots,
  ${agg(`SELECT t.shot_id, t.clip_name, t.good, t.footage_id, f.frame_rate AS footage_frame_rate FROM take t JOIN shot sh ON sh.id = t.shot_id JOIN segment s ON s.id = sh.segment_id LEFT JOIN footage f ON f.id = t.footage_id WHERE s.episode_id = e.id ORDER BY t.created_at`)} AS takes,
  ${agg(`SELECT ch.id, ch.start_frame, ch.title, ch.url FROM chapter ch WHERE ch.episode_id = e.id ORDER BY ch.start_frame, ch.created_at, ch.id`)} AS chapters,
  ${agg(`SELECT pa.id AS part_id, pa.sku, pa.name, pa.brand, pa.category, pa.status, pa.store_url, pa.price_cents, pa.currency, n.id AS note_id, n.program_frame, n.text, tl.code AS link_code
     FROM segment_note_part np JOIN segment_note n ON n.id = np.note_id JOIN part pa ON pa.id = np.part_id
     LEFT JOIN tracked_link tl ON tl.part_id = pa.id AND tl.episode_id = n.episode_id
     WHERE n.episode_id = e.id ORDER BY n.program_frame ASC NULLS LAST, n.created_at`)} AS featured
FROM episode e JOIN channel c ON c.id = e.channel_id WHERE e.channel_id = $2 AND e.id = $1`;

const HISTORY = `SELECT sm.id, sm.from_stage, sm.to_stage, sm.note, sm.created_at, p.name AS person_name
FROM stage_move sm JOIN episode e ON e.id = sm.episode_id LEFT JOIN person p ON p.id = sm.person_id
WHERE sm.episode_id = $1 AND e.channel_id = $2 ORDER BY sm.created_at DESC, sm.id DESC`;

const FORM_LISTS = `SELECT
  ${agg(`SELECT b.id, b.name, b.year, b.vehicle_type FROM build b WHERE b.channel_id = $1 ORDER BY b.name`)} AS builds`;

const CREW = `SELECT p.id, p.name, m.roles FROM membership m JOIN person p ON p.id = m.person_id
WHERE m.channel_id = $1 AND m.disabled_at IS NULL ORDER BY p.name`;

const server = createServer(async (request, response) => {
	try {
		const url = new URL(request.url ?? '/', 'http://bare');
		const identity = (await run('identity', IDENTITY, [url.searchParams.get('session')])).rows;
		if (identity.length === 0) {
			response.writeHead(401).end();
			return;
		}
		const channelId = identity[0].id;
		const episodeId = url.searchParams.get('episode');
		const page = url.pathname === '/page';
		const reads: Promise<pg.QueryResult>[] = [
			run('detail', DETAIL, [episodeId, channelId]),
			run('materials', MATERIALS, [episodeId, channelId])
		];
		if (page)
			reads.push(
				run('history', HISTORY, [episodeId, channelId]),
				run('form-lists', FORM_LISTS, [channelId]),
				run('crew', CREW, [channelId])
			);
		const [detail, materials, history, lists, crew] = await Promise.all(reads);
		const body = JSON.stringify({
			episode: detail.rows[0],
			materials: materials.rows[0],
			history: history?.rows,
			options: lists ? { ...lists.rows[0], crew: crew.rows } : undefined
		});
		response.writeHead(200, { 'content-type': 'application/json' }).end(body);
	} catch (failure) {
		response.writeHead(500).end(String(failure));
	}
});
server.listen(Number(process.env.PORT), '127.0.0.1');
