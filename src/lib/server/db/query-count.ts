/**
 * Counting database queries per request, for the query-budget tests only. With
 * WRENCHROLL_COUNT_QUERIES=1 the Kysely instance gets a `log` hook that adds one to the count of
 * the request it runs in (an AsyncLocalStorage store opened by `countQueries` in hooks.server.ts),
 * and the answer carries the total in `X-Query-Count`. Without the variable (production, the demo,
 * the benches' measured servers) there is no hook, no store and no header: nothing is paid.
 *
 * With WRENCHROLL_RECORD_QUERIES=<file> as well, each request's statements (SQL, values, and
 * whether it goes out as a named prepared statement) are appended to that file as one JSON line
 * once the request is answered. The episode bench records one request this way and has its bare
 * baseline send exactly those statements (scripts/lib/bare-episode-server.ts).
 */
import { AsyncLocalStorage } from 'node:async_hooks';
import { appendFileSync } from 'node:fs';
import type { LogEvent } from 'kysely';
import { isNamedStatement } from './prepared-statements';

export const QUERY_COUNT_HEADER = 'x-query-count';

/** Read once at start: counting cannot be switched on by a request. */
export const countingQueries = process.env.WRENCHROLL_COUNT_QUERIES === '1';

const recordTo = countingQueries ? process.env.WRENCHROLL_RECORD_QUERIES || null : null;

/** One statement a request sent, as the bench's bare baseline sends it again. */
export interface RecordedStatement {
	sql: string;
	parameters: readonly unknown[];
	named: boolean;
}

const requestCount = new AsyncLocalStorage<{
	queries: number;
	statements: RecordedStatement[] | null;
}>();

/** The Kysely `log` option: undefined unless counting is on. */
export const queryCountLog = countingQueries
	? (event: LogEvent) => {
			if (event.level === 'query') {
				const store = requestCount.getStore();
				if (!store) return;
				store.queries += 1;
				const { sql, parameters } = event.query;
				store.statements?.push({ sql, parameters, named: isNamedStatement(sql) });
			}
		}
	: undefined;

/** Runs `work` (a request) with its own count and puts the count on its answer. */
export async function countQueries(
	work: () => Promise<Response>,
	request?: { method: string; path: string }
): Promise<Response> {
	const store = { queries: 0, statements: recordTo ? ([] as RecordedStatement[]) : null };
	const response = await requestCount.run(store, work);
	if (recordTo && store.statements)
		appendFileSync(recordTo, JSON.stringify({ ...request, statements: store.statements }) + '\n');
	try {
		response.headers.set(QUERY_COUNT_HEADER, String(store.queries));
		return response;
	} catch {
		// A response with immutable headers (a fetch answer passed through): copy it.
		const headers = new Headers(response.headers);
		headers.set(QUERY_COUNT_HEADER, String(store.queries));
		return new Response(response.body, {
			status: response.status,
			statusText: response.statusText,
			headers
		});
	}
}
