/**
 * Sign-in with Auth.js: e-mail and password (Credentials), JWT cookies that carry only a session id.
 * The session row in person_session is the real session: sign-out deletes it, and every request
 * reads the person, roles and disabled flags from the database (see hooks.server.ts).
 * The configuration is made per request (Auth.js's lazy initialisation) so that the credentials
 * check knows the connecting client and the browser's unlock grant, for throttling.
 */
import { SvelteKitAuth, CredentialsSignin } from '@auth/sveltekit';
import Credentials from '@auth/sveltekit/providers/credentials';
import { dev } from '$app/environment';
import { env } from '$env/dynamic/private';
import { signInSchema } from '$lib/schemas/people';
import {
	verifyCredentials,
	openSession,
	closeSession,
	SESSION_DAYS,
	type ThrottledBy
} from '$lib/server/auth/sessions';
import { UNLOCK_COOKIE } from '$lib/server/auth/unlock';
import { connectingAddress } from '$lib/server/auth/client-address';
import { safeRedirectPath } from '$lib/safe-redirect';

/** The code Auth.js passes on in its redirect: `throttled` (this address) or `throttled-client`. */
class TooManyAttempts extends CredentialsSignin {
	constructor(by: ThrottledBy) {
		super();
		this.code = by === 'client' ? 'throttled-client' : 'throttled';
	}
}

export const {
	handle: authHandle,
	signIn,
	signOut
} = SvelteKitAuth(async (event) => ({
	trustHost: dev || env.AUTH_TRUST_HOST === 'true' || Boolean(env.ORIGIN),
	basePath: '/auth',
	session: { strategy: 'jwt', maxAge: SESSION_DAYS * 24 * 3600 },
	pages: { signIn: '/signin', error: '/signin' },
	providers: [
		Credentials({
			credentials: { email: {}, password: {} },
			async authorize(raw) {
				const parsed = signInSchema.safeParse(raw);
				if (!parsed.success) return null;
				const outcome = await verifyCredentials(parsed.data.email, parsed.data.password, {
					clientAddress: connectingAddress(event),
					unlockSecret: event.cookies.get(UNLOCK_COOKIE)
				});
				if (outcome.ok) return outcome.person;
				if (outcome.throttled) {
					// hooks.server.ts turns this into 429 with Retry-After.
					event.locals.retryAfter = outcome.retryAfter;
					throw new TooManyAttempts(outcome.throttled);
				}
				return null;
			}
		})
	],
	callbacks: {
		/** Auth.js's own redirect target (its callbackUrl) goes through the same check as every other. */
		redirect({ url, baseUrl }) {
			const target = new URL(url, baseUrl);
			if (target.origin !== baseUrl) return baseUrl;
			return baseUrl + safeRedirectPath(target.pathname + target.search + target.hash);
		},
		async jwt({ token, user }) {
			if (user?.id) token.sid = await openSession(user.id);
			return token;
		},
		session({ session, token }) {
			return { ...session, sid: typeof token.sid === 'string' ? token.sid : undefined };
		}
	},
	events: {
		async signOut(message) {
			const sid = 'token' in message ? message.token?.sid : undefined;
			if (typeof sid === 'string') await closeSession(sid);
		}
	},
	logger: {
		// A wrong password is an ordinary event, not a stack trace in the server log.
		error(error) {
			// A forged or expired cookie (JWTSessionError) is just a signed-out visitor.
			const kind = (error as { type?: string }).type ?? error.name;
			if (kind === 'CredentialsSignin' || kind === 'JWTSessionError') return;
			console.error('[auth]', error.name, error.message);
		},
		warn() {}
	}
}));
