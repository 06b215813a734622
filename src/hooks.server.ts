import {
	error,
	redirect,
	json,
	type Handle,
	type RequestEvent,
	type ServerInit,
	type HandleServerError
} from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { env } from '$env/dynamic/private';
import { authHandle } from './auth';
import { CHANNEL_COOKIE, identityFromSession, identityFromToken } from '$lib/server/auth/identity';
import { sessionIdFromCookie } from '$lib/server/auth/session-cookie';
import { startMailSender, stopMailSender } from '$lib/server/mail/outbox';
import { db } from '$lib/server/db';
import { closeUploadLocks, handleUpload } from '$lib/server/footage/tus-server';
import { offerNodeRoutes } from '$lib/server/footage/node-uploads';
import { startUploadSweep, stopUploadSweep } from '$lib/server/footage/upload-sweep';
import { startMediaWorker, stopMedia } from '$lib/server/media/queue';
import { withSecurityHeaders } from '$lib/server/http/security-headers';
import { withBucketMedia } from '$lib/server/http/object-response';
import { prepareObjectStorage } from '$lib/server/footage/object-store';
import { isDatabaseUnavailable } from '$lib/server/db/outage';
import {
	asOutage,
	databaseDownAction,
	databaseDownError,
	databaseDownJson
} from '$lib/server/http/outage';
import { UPLOAD_PATH } from '$lib/upload-rules';
import { safeRedirectPath } from '$lib/safe-redirect';
import { standInHash } from '$lib/server/auth/passwords';
import { channelLinkHandle } from '$lib/server/channel/current-channel';
import { countingQueries, countQueries } from '$lib/server/db/query-count';

// server.js (production) answers uploads itself, before SvelteKit; under vite dev uploadHandle does.
offerNodeRoutes();

export const init: ServerInit = async () => {
	// Object storage settings with a mistake stop the start here, naming the setting; the S3
	// client is loaded only when they are there.
	await prepareObjectStorage();
	if (env.WRENCHROLL_PROCESS === 'worker') {
		// worker.js: this process only makes media (no HTTP, no mail); it stops on SIGTERM/SIGINT.
		await startMediaWorker();
		const stop = () =>
			void stopMedia()
				.then(() => db.destroy())
				.then(
					() => process.exit(0),
					() => process.exit(1)
				);
		process.once('SIGTERM', stop);
		process.once('SIGINT', stop);
		return;
	}
	// npm start and the tests make media in the app process too; a failure here leaves the rows waiting.
	if (env.WRENCHROLL_MEDIA_WORKER === 'inline')
		void startMediaWorker().catch((failure) => console.error('media worker:', failure.message));
	startMailSender();
	startUploadSweep();
	await standInHash(); // made now, so no sign-in pays for making it
	// adapter-node emits this after it stops taking requests: stop the mail sender and the upload
	// sweep, then close the upload locks and the pool so the process can exit.
	process.on(
		'sveltekit:shutdown',
		() =>
			void Promise.all([stopMailSender(), stopUploadSweep(), stopMedia()]).then(() =>
				Promise.all([closeUploadLocks(), db.destroy()])
			)
	);
};

/** Reads the person, roles and channel from the database on every request (a disabled account loses access at once). */
const identityHandle: Handle = async ({ event, resolve }) => {
	event.locals.person = null;
	event.locals.channel = null;
	event.locals.roles = [];
	event.locals.channels = [];
	event.locals.via = null;
	event.locals.sessionId = null;

	const authorization = event.request.headers.get('authorization');
	if (authorization?.startsWith('Bearer ')) {
		const identity = await identityFromToken(authorization.slice(7).trim());
		if (!identity.person)
			return json(
				{ error: 'That API token is unknown or revoked. Create a new one under Account.' },
				{ status: 401 }
			);
		Object.assign(event.locals, identity, { via: 'token' });
		return resolve(event);
	}

	// The Auth.js session cookie only carries the session id, so it is decoded with Auth.js's own
	// getToken (same cookie name, salt and secret) instead of a full round through its session
	// endpoint, which would also re-encrypt the cookie on every request.
	const sid = await sessionIdFromCookie(
		event.request,
		env.AUTH_SECRET,
		event.url.protocol === 'https:'
	);
	if (sid) {
		let identity: Awaited<ReturnType<typeof identityFromSession>>;
		try {
			identity = await identityFromSession(sid, event.cookies.get(CHANNEL_COOKIE));
		} catch (failure) {
			if (!isDatabaseUnavailable(failure)) throw failure;
			// Who is calling is unknown while the database is down: say so rather than "sign in".
			logOutage(failure);
			event.locals.databaseDown = true;
			if (event.url.pathname.startsWith('/api/')) return databaseDownJson();
			if (event.request.headers.get('x-sveltekit-action') === 'true') return databaseDownAction();
			// Pages go on: the (app) layout answers 503 with the error page; public pages still show.
			return resolve(event);
		}
		if (identity.person) Object.assign(event.locals, identity, { via: 'session', sessionId: sid });
	}
	return resolve(event);
};

const logOutage = (failure: unknown) =>
	console.error(
		'database unavailable:',
		failure instanceof Error ? failure.message || failure.name : failure
	);

const wantsJson = (event: RequestEvent) =>
	event.url.pathname.startsWith('/api/') ||
	!(event.request.headers.get('accept') ?? '').includes('text/html');

/**
 * PostgreSQL out of reach: 503 with Retry-After instead of 500 (http/outage.ts). Failures inside
 * loads, actions and endpoints reach handleError, which marks the request; failures in the hooks
 * below (API token look-up, upload checks) arrive here.
 */
const outageHandle: Handle = async ({ event, resolve }) => {
	event.locals.databaseDown = false;
	let response: Response;
	try {
		response = await resolve(event);
	} catch (failure) {
		if (!isDatabaseUnavailable(failure)) throw failure;
		logOutage(failure);
		event.locals.databaseDown = true;
		if (wantsJson(event)) return databaseDownJson();
		error(503, databaseDownError);
	}
	const outage = response.status === 500 || response.status === 503;
	return event.locals.databaseDown && outage ? asOutage(response) : response;
};

const PUBLIC_PATHS = [
	/^\/signin$/,
	/^\/auth\//,
	/^\/welcome\//,
	/^\/reset(\/|$)/,
	/^\/unlock(\/|$)/,
	/^\/go\//,
	/^\/dev\/mail/,
	/^\/healthz$/
];

/** Everything but the public pages needs a signed-in crew member; roles are checked again in each route. */
/** The first `?/name` of a page action request, as SvelteKit reads it. */
const actionName = (url: URL) =>
	[...url.searchParams.keys()].find((key) => key.startsWith('/'))?.slice(1);

const guardHandle: Handle = async ({ event, resolve }) => {
	const path = event.url.pathname;
	// SvelteKit throws a plain Error (a 500) for the reserved action name; it is input, so a 404.
	if (event.request.method === 'POST' && actionName(event.url) === 'default') {
		const message = 'There is no such form action on this page.';
		// use:enhance reads { type: 'error', error } (SvelteKit's action answer); a plain post, JSON.
		return event.request.headers.get('x-sveltekit-action') === 'true'
			? json({ type: 'error', error: { message } }, { status: 404 })
			: json({ error: message }, { status: 404 });
	}
	if (PUBLIC_PATHS.some((pattern) => pattern.test(path))) return resolve(event);
	if (!event.locals.person && !event.locals.databaseDown) {
		if (path.startsWith('/api/'))
			return json(
				{ error: 'Sign in, or send a personal API token as "Authorization: Bearer …".' },
				{ status: 401 }
			);
		if (event.request.method !== 'GET')
			return json(
				{ error: 'Your session has ended. Sign in again; nothing was changed.' },
				{ status: 401 }
			);
		const next = safeRedirectPath(path + event.url.search);
		redirect(303, `/signin?next=${encodeURIComponent(next)}`);
	}
	return resolve(event);
};

/**
 * Resumable uploads go straight to tus after their own role checks (no byte is stored before them).
 * In production server.js answers them before SvelteKit (node-uploads.ts); this serves vite dev.
 */
const uploadHandle: Handle = async ({ event, resolve }) => {
	const path = event.url.pathname;
	if (path === UPLOAD_PATH || path.startsWith(UPLOAD_PATH + '/')) return handleUpload(event);
	return resolve(event);
};

/** Security headers on every answer the app makes, Auth.js's and tus's included. */
const securityHeadersHandle: Handle = async ({ event, resolve }) =>
	withBucketMedia(
		withSecurityHeaders(
			await resolve(event),
			Boolean(event.locals.person) || event.url.pathname.startsWith('/api/')
		)
	);

/**
 * A sign-in or reset refused by throttling sets `locals.retryAfter`: its answer gets Retry-After
 * (RFC 9110 §10.2.3, in seconds) and status 429 (RFC 6585 §4), also the JSON of a form posted with
 * JavaScript (SvelteKit answers those 200 with the status inside) and Auth.js's own endpoint.
 */
const throttleAnswerHandle: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	const seconds = event.locals.retryAfter;
	if (!seconds) return response;
	const retryAfter = String(seconds);
	if (event.url.pathname.startsWith('/auth/'))
		return json(
			{
				error: `Too many sign-in tries. Try again in ${retryAfter} seconds, or ask for an unlock link at /unlock.`
			},
			{ status: 429, headers: { 'retry-after': retryAfter, 'cache-control': 'no-store' } }
		);
	const headers = new Headers(response.headers);
	headers.set('retry-after', retryAfter);
	const status = response.status === 200 ? 429 : response.status;
	return new Response(response.body, { status, statusText: '', headers });
};

/**
 * Auth.js answers its own endpoints under /auth/ (sign-in, sign-out, CSRF). Nothing else reads its
 * `locals.auth` (identityHandle decodes the cookie itself), so other requests skip building its
 * configuration.
 */
const authEndpointHandle: Handle = (input) =>
	input.event.url.pathname.startsWith('/auth/') ? authHandle(input) : input.resolve(input.event);

/** Only with WRENCHROLL_COUNT_QUERIES=1 (the query-budget tests, the episode bench's recording): X-Query-Count on every answer. */
const queryCountHandle: Handle = ({ event, resolve }) =>
	countQueries(async () => resolve(event), {
		method: event.request.method,
		path: event.url.pathname
	});

export const handle: Handle = sequence(
	...(countingQueries ? [queryCountHandle] : []),
	securityHeadersHandle,
	throttleAnswerHandle,
	outageHandle,
	authEndpointHandle,
	identityHandle,
	uploadHandle,
	guardHandle,
	channelLinkHandle
);

export const handleError: HandleServerError = ({ error, event, status }) => {
	if (isDatabaseUnavailable(error)) {
		logOutage(error);
		event.locals.databaseDown = true; // outageHandle turns the 500 into a 503
		return databaseDownError;
	}
	if (status !== 404) console.error(error);
	return { message: status === 404 ? 'Not found.' : 'Something went wrong on the server.' };
};
