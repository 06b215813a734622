// See https://svelte.dev/docs/kit/types#app.d.ts
import type { Role } from '$lib/roles';
import type { FrameRate } from '$lib/timecode';

declare global {
	namespace App {
		interface Error {
			message: string;
			issues?: Record<string, string[]>;
			/** Set when the error is that the database is out of reach (a 503). */
			down?: 'database';
		}
		interface Locals {
			/** The signed-in person, read from the database on every request. */
			person: { id: string; email: string; name: string } | null;
			/** The channel this request works in; every query is scoped to it. */
			channel: { id: string; name: string; frameRate: FrameRate } | null;
			/** The person's roles in the current channel. */
			roles: Role[];
			/** Every channel the person may enter, for the switcher. */
			channels: { id: string; name: string; roles: Role[] }[];
			/** How the caller proved who they are. */
			via: 'session' | 'token' | null;
			sessionId: string | null;
			/** The database did not answer during this request (the answer becomes a 503). */
			databaseDown: boolean;
			/** Set when throttling refused a sign-in or a mail: seconds to wait (hooks.server.ts answers 429). */
			retryAfter?: number;
		}
		interface PageData {
			person?: App.Locals['person'];
		}
	}
}

export {};
