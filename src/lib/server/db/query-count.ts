/**
 * Counting database queries per request, for the query-budget tests only. With
 * WRENCHROLL_COUNT_QUERIES=1 the Kysely instance gets a `log` hook that adds one to the count of
 * the request it runs in (an AsyncLocalStorage store opened by `countQueries` in hooks.server.ts),
 * and the answer carries the total in `X-Query-Count`. Without the variable (production, the demo,
 * the benches) there is no hook, no store and no header: nothing is paid.
 */
import { AsyncLocalStorage } from 'node:async_hooks';
import type { LogEvent } from 'kysely';

export const QUERY_COUNT_HEADER = 'x-query-count';

/** Read once at start: counting cannot be switched on by a request. */
export const countingQueries = process.env.WRENCHROLL_COUNT_QUERIES === '1';

const requestCount = new AsyncLocalStorage<{ queries: number }>();

/** The Kysely `log` option: undefined unless counting is on. */
export const queryCountLog = countingQueries
	? (event: LogEvent) => {
			if (event.level === 'query') {
				const store = requestCount.getStore();
				if (store) store.queries += 1;
			}
		}
	: undefined;

/** Runs `work` (a request) with its own count and puts the count on its answer. */
export async function countQueries(work: () => Promise<Response>): Promise<Response> {
	const store = { queries: 0 };
	const response = await requestCount.run(store, work);
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
