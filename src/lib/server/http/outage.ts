/**
 * Answers while PostgreSQL is out of reach: 503 Service Unavailable with Retry-After (RFC 9110
 * §15.6.4 and §10.2.3) instead of a 500, as JSON `{ error }` for the API, an ActionResult for a
 * form sent by `use:enhance`, and the app's error page (src/routes/+error.svelte) for pages.
 * Recovery needs nothing: the pool connects again on the next query.
 */
import { json } from '@sveltejs/kit';

export const RETRY_AFTER_SECONDS = 30;

export const DATABASE_DOWN_MESSAGE =
	"Wrenchroll can't reach its database right now, so nothing can be read or saved. Nothing you saved is lost: try again in a minute.";

/** The App.Error of an outage; +error.svelte shows it as one. */
export const databaseDownError: App.Error = { message: DATABASE_DOWN_MESSAGE, down: 'database' };

const retryAfter = { 'retry-after': String(RETRY_AFTER_SECONDS) };

export const databaseDownJson = () =>
	json({ error: DATABASE_DOWN_MESSAGE }, { status: 503, headers: retryAfter });

/** What `use:enhance` expects back from an action (SvelteKit's ActionResult of type "error"). */
export const databaseDownAction = () =>
	json({ type: 'error', error: databaseDownError }, { status: 503, headers: retryAfter });

/** An answer SvelteKit rendered because of the outage (a 500, or the layout's 503), as a 503 with Retry-After. */
export function asOutage(response: Response): Response {
	const headers = new Headers(response.headers);
	headers.set('retry-after', String(RETRY_AFTER_SECONDS));
	return new Response(response.body, { status: 503, statusText: 'Service Unavailable', headers });
}
