/**
 * The one guard every page load, form action and API route calls: it answers 401 to a caller
 * who is not signed in and 403 to one without any of the named roles in the current channel.
 */
import { error, type RequestEvent } from '@sveltejs/kit';
import type { Role } from '../db/types';

export interface Caller {
	person: NonNullable<App.Locals['person']>;
	channel: NonNullable<App.Locals['channel']>;
	roles: Role[];
}

/** With no roles named, any signed-in crew member passes. */
export function requireRole(event: Pick<RequestEvent, 'locals'>, ...allowed: Role[]): Caller {
	const { person, channel, roles } = event.locals;
	if (!person || !channel) error(401, 'Sign in to continue.');
	if (allowed.length > 0 && !allowed.some((role) => roles.includes(role))) {
		const names = allowed.join(' or ');
		error(
			403,
			`This needs the ${names} role in ${channel.name}. Ask your producer if you need it.`
		);
	}
	return { person, channel, roles };
}

export const hasRole = (locals: App.Locals, ...roles: Role[]) =>
	roles.some((role) => locals.roles.includes(role));
