/**
 * The one DELETE handler of the API routes that remove a versioned record: the caller's role is
 * checked first, then `?version=` (optional; when sent, the removal happens only if nobody changed
 * the record since that version was read, else 409 with the current row).
 */
import { json, type RequestEvent } from '@sveltejs/kit';
import { requireRole, type Caller } from '../auth/guard';
import type { Role } from '../db/types';
import { recordVersion } from '$lib/schemas/fields';
import { api, parseWith } from './api';

const versionQuery = recordVersion.optional();

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export function deleteWithVersion<Event extends RequestEvent<any, any>>(
	roles: readonly Role[],
	remove: (event: Event, caller: Caller, version: number | undefined) => Promise<unknown>
): (event: Event) => Promise<Response> {
	return api<Event>(async (event) => {
		const caller = requireRole(event, ...roles);
		const version = parseWith(versionQuery, event.url.searchParams.get('version') ?? undefined);
		return json(await remove(event, caller, version));
	});
}
