import {
	redirect,
	json,
	type Handle,
	type ServerInit,
	type HandleServerError
} from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { getToken } from '@auth/core/jwt';
import { env } from '$env/dynamic/private';
import { authHandle } from './auth';
import { CHANNEL_COOKIE, identityFromSession, identityFromToken } from '$lib/server/identity';
import { startMailSender, stopMailSender } from '$lib/server/mail/outbox';
import { db } from '$lib/server/db';
import { handleUpload } from '$lib/server/uploads';
import { startScriptReaders } from '$lib/server/episodes/script-reader';
import { UPLOAD_PATH } from '$lib/uploads';

export const init: ServerInit = async () => {
	startMailSender();
	// Start the script readers now, so the first script anybody opens does not wait for them.
	void startScriptReaders();
	// adapter-node emits this after it stops taking requests: stop the mail sender, then close the
	// pool so the process can exit.
	process.on('sveltekit:shutdown', () => void stopMailSender().then(() => db.destroy()));
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

	// The Auth.js session cookie only carries the session id, so it is decoded here with Auth.js's
	// own getToken (same cookie name, salt and secret) instead of a full round through its session
	// endpoint, which would also re-encrypt the cookie on every request. A forged, stale or expired
	// cookie decodes to null: simply no session.
	const token = await getToken({
		req: event.request,
		secret: env.AUTH_SECRET,
		secureCookie: event.url.protocol === 'https:'
	}).catch(() => null);
	const sid = typeof token?.sid === 'string' ? token.sid : undefined;
	if (sid) {
		const identity = await identityFromSession(sid, event.cookies.get(CHANNEL_COOKIE));
		if (identity.person) Object.assign(event.locals, identity, { via: 'session', sessionId: sid });
	}
	return resolve(event);
};

const PUBLIC_PATHS = [
	/^\/signin$/,
	/^\/auth\//,
	/^\/welcome\//,
	/^\/reset(\/|$)/,
	/^\/go\//,
	/^\/dev\/mail/,
	/^\/healthz$/
];

/** Everything but the public pages needs a signed-in crew member; roles are checked again in each route. */
const guardHandle: Handle = async ({ event, resolve }) => {
	const path = event.url.pathname;
	if (PUBLIC_PATHS.some((pattern) => pattern.test(path))) return resolve(event);
	if (!event.locals.person) {
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
		redirect(303, `/signin?next=${encodeURIComponent(path + event.url.search)}`);
	}
	return resolve(event);
};

/** Resumable uploads go straight to tus after their own role checks (no byte is stored before them). */
const uploadHandle: Handle = async ({ event, resolve }) => {
	const path = event.url.pathname;
	if (path === UPLOAD_PATH || path.startsWith(UPLOAD_PATH + '/')) return handleUpload(event);
	return resolve(event);
};

export const handle: Handle = sequence(authHandle, identityHandle, uploadHandle, guardHandle);

export const handleError: HandleServerError = ({ error, status }) => {
	if (status !== 404) console.error(error);
	return { message: status === 404 ? 'Not found.' : 'Something went wrong on the server.' };
};
