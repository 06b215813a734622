/**
 * The storage bench's baseline (scripts/bench-storage.ts): a bare node:http server with a pg pool
 * of the app's size that reads who is calling (by session id) and runs exactly the SQL the app's
 * storage view runs (compiled by the bench from src/lib/server/footage/storage-query.ts and passed
 * in BARE_STORAGE_QUERIES), answering the row as JSON. No framework, no role check, no mapping:
 * what the data alone costs.
 *
 *   DATABASE_URL=… PORT=… BARE_STORAGE_QUERIES='{"first":{sql,parameters},"later":{…}}' tsx scripts/lib/bare-storage-server.ts
 *   GET /first?session=<id>   GET /later?session=<id>
 */
import { createServer } from 'node:http';
import pg from 'pg';
import { IDENTITY } from './bare-identity.ts';

type Compiled = { sql: string; parameters: unknown[] };
const queries = JSON.parse(process.env.BARE_STORAGE_QUERIES ?? '{}') as Record<string, Compiled>;
const pool = new pg.Pool({ connectionString: process.env.DATABASE_URL, max: 10 });

const server = createServer(async (request, response) => {
	try {
		const url = new URL(request.url ?? '/', 'http://bare');
		const query = queries[url.pathname.slice(1)];
		if (!query) {
			response.writeHead(404).end();
			return;
		}
		const identity = (await pool.query(IDENTITY, [url.searchParams.get('session')])).rows;
		if (identity.length === 0) {
			response.writeHead(401).end();
			return;
		}
		const { rows } = await pool.query(query.sql, query.parameters);
		response.writeHead(200, { 'content-type': 'application/json' }).end(JSON.stringify(rows[0]));
	} catch (failure) {
		response.writeHead(500).end(String(failure));
	}
});
server.listen(Number(process.env.PORT), '127.0.0.1');
