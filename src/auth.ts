/**
 * Sign-in with Auth.js: e-mail and password (Credentials), JWT cookies that carry only a session id.
 * The session row in person_session is the real session: sign-out deletes it, and every request
 * reads the person, roles and disabled flags from the database (see hooks.server.ts).
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
	SESSION_DAYS
} from '$lib/server/auth/sessions';
import { safeRedirectPath } from '$lib/safe-redirect';

class TooManyAttempts extends CredentialsSignin {
	code = 'throttled';
}

export const {
	handle: authHandle,
	signIn,
	signOut
} = SvelteKitAuth({
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
				const result = await verifyCredentials(parsed.data.email, parsed.data.password);
				if (result === 'throttled') throw new TooManyAttempts();
				return result ? { id: result.id, email: result.email, name: result.name } : null;
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
});
