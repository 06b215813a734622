import { isbot } from 'isbot';
import { followTrackedLink } from '$lib/server/merch/tracked-links';
import { isDatabaseUnavailable } from '$lib/server/db/outage';
import { RETRY_AFTER_SECONDS } from '$lib/server/http/outage';
import type { RequestHandler } from './$types';

/**
 * The public short link. GET: 302 to the store page with campaign parameters, and one more click
 * today when a person's browser asked. Crawlers, link previews and scripts (a User-Agent the
 * `isbot` list knows, or none at all) and every HEAD get the same answer, uncounted. Only the
 * User-Agent is looked at, and nothing about the visitor is stored. `no-store` so every click
 * reaches us instead of a cached redirect.
 */
const headers = (location: string) => ({
	location,
	'cache-control': 'no-store',
	'x-robots-tag': 'noindex'
});

const unknown = () =>
	new Response('That link is unknown or was removed.\n', {
		status: 404,
		headers: { 'content-type': 'text/plain; charset=utf-8', 'cache-control': 'no-store' }
	});

const byPerson = (request: Request) => {
	const agent = request.headers.get('user-agent')?.trim();
	return Boolean(agent) && !isbot(agent);
};

/** Viewers, not crew, follow these links: a plain word if the database is out of reach. */
const follow = (code: string, count: boolean) =>
	followTrackedLink(code, { count }).catch((failure) => {
		if (!isDatabaseUnavailable(failure)) throw failure;
		console.error('database unavailable:', (failure as Error).message);
		return 'down' as const;
	});

const down = (method: string) =>
	new Response(
		method === 'HEAD' ? null : 'That link is out of reach for a moment. Try again in a minute.\n',
		{
			status: 503,
			headers: {
				'content-type': 'text/plain; charset=utf-8',
				'cache-control': 'no-store',
				'retry-after': String(RETRY_AFTER_SECONDS)
			}
		}
	);

export const GET: RequestHandler = async ({ params, request }) => {
	const target = await follow(params.code, byPerson(request));
	if (target === 'down') return down('GET');
	return target
		? new Response(null, { status: 302, headers: headers(target.location) })
		: unknown();
};

// Without its own HEAD, SvelteKit would run GET for a HEAD request, and count it.
export const HEAD: RequestHandler = async ({ params }) => {
	const target = await follow(params.code, false);
	if (target === 'down') return down('HEAD');
	return target
		? new Response(null, { status: 302, headers: headers(target.location) })
		: new Response(null, { status: 404, headers: { 'cache-control': 'no-store' } });
};
