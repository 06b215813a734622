/**
 * The bench's baseline for the episode page and API (scripts/bench-episode.ts): a bare node:http
 * server with a pg pool of the app's size that sends PostgreSQL exactly the statements the app
 * sent for one such request, and answers their rows as JSON.
 *
 * The statements are the app's own, recorded by the bench from a server started with
 * WRENCHROLL_COUNT_QUERIES=1 and WRENCHROLL_RECORD_QUERIES (src/lib/server/db/query-count.ts): the
 * same SQL with the same values (who is calling, by session id; the episode with its crew and
 * builds; everything its gate reads; for /page also the stage history and the form choices). So
 * the baseline cannot drift from what the app reads as the app changes. The first statement (who
 * is calling) goes first, then all the rest at once: the least waiting there can be (the app runs
 * some of them one after another, a layout's before its page's).
 * No framework, no rendering, no gate computation: what the data alone costs.
 *
 * With BARE_NAMED=1 each statement the app sends as a named prepared statement
 * (src/lib/server/db/prepared-statements.ts) goes out named here too, parsed and planned once per
 * connection: the baseline the bench judges against. Without it every statement goes out unnamed,
 * as node-postgres does by default, and PostgreSQL parses and plans each one on every run: the
 * bench's reference.
 *
 *   DATABASE_URL=… PORT=… BARE_STATEMENTS=<file> [BARE_NAMED=1] tsx scripts/lib/bare-episode-server.ts
 *   GET /api   GET /page      (the file: { "api": [statement…], "page": [statement…] })
 */
import { readFileSync } from 'node:fs';
import { createServer } from 'node:http';
import pg from 'pg';

interface Statement {
	sql: string;
	parameters: unknown[];
	named: boolean;
}

const recorded = JSON.parse(readFileSync(process.env.BARE_STATEMENTS ?? '', 'utf8')) as Record<
	'api' | 'page',
	Statement[]
>;
const pool = new pg.Pool({ connectionString: process.env.DATABASE_URL, max: 10 });
const namedHere = process.env.BARE_NAMED === '1';
const names = new Map<string, string>();
const nameOf = (sql: string) => {
	let name = names.get(sql);
	if (!name) names.set(sql, (name = `bare_${names.size + 1}`));
	return name;
};
const run = ({ sql, parameters, named }: Statement) =>
	namedHere && named
		? pool.query({ name: nameOf(sql), text: sql, values: parameters })
		: pool.query(sql, parameters);

const server = createServer(async (request, response) => {
	try {
		const statements = request.url === '/page' ? recorded.page : recorded.api;
		const [first, ...rest] = statements;
		const identity = await run(first);
		if (identity.rows.length === 0) {
			response.writeHead(401).end();
			return;
		}
		const results = await Promise.all(rest.map(run));
		const body = JSON.stringify({
			identity: identity.rows,
			rows: results.map((result) => result.rows)
		});
		response.writeHead(200, { 'content-type': 'application/json' }).end(body);
	} catch (failure) {
		response.writeHead(500).end(String(failure));
	}
});
server.listen(Number(process.env.PORT), '127.0.0.1');
