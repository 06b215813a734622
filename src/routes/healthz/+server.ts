import { json } from '@sveltejs/kit';
import { databaseAnswers } from '$lib/server/db/outage';
import { RETRY_AFTER_SECONDS } from '$lib/server/http/outage';
import type { RequestHandler } from './$types';

/**
 * For a monitor or load balancer: 200 when the app and its database answer, else 503 naming what is
 * down. The database gets a cheap `SELECT 1` with a short time limit, so a hung server is "down" too.
 */
export const GET: RequestHandler = async () => {
	const up = await databaseAnswers(2000);
	return up
		? json({ status: 'ok', database: 'up' }, { headers: { 'cache-control': 'no-store' } })
		: json(
				{ status: 'down', database: 'down', error: 'The database (PostgreSQL) is not answering.' },
				{
					status: 503,
					headers: { 'cache-control': 'no-store', 'retry-after': String(RETRY_AFTER_SECONDS) }
				}
			);
};
