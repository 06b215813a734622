/**
 * Which channel a signed-in person works in. The channel cookie holds this browser's choice; the
 * person's `last_channel_id` holds the last choice made anywhere, which a browser without the
 * cookie (a new sign-in: signing out clears the cookie) starts in. Both are written here only: by
 * the channel switcher, and when a link opens a record of another of the person's channels.
 */
import { redirect, type Handle, type RequestEvent } from '@sveltejs/kit';
import { db } from '../db';
import { CHANNEL_COOKIE, isUuid } from '../auth/identity';
import { SWITCHED_PARAM, RECORD_SECTIONS, type RecordSection } from '$lib/channel-switch';

const COOKIE_OPTIONS = {
	path: '/',
	httpOnly: true,
	sameSite: 'lax',
	maxAge: 365 * 24 * 3600
} as const;

/** Makes `channelId` the current channel of this browser and the person's remembered one. The caller has checked membership. */
export async function chooseChannel(event: RequestEvent, personId: string, channelId: string) {
	event.cookies.set(CHANNEL_COOKIE, channelId, COOKIE_OPTIONS);
	await db
		.updateTable('person')
		.set({ lastChannelId: channelId })
		.where('id', '=', personId)
		.execute();
}

/** Signing out: the next sign-in on this browser starts in the channel the person chose last. */
export function forgetBrowserChannel(event: RequestEvent) {
	event.cookies.delete(CHANNEL_COOKIE, { path: '/' });
}

const TABLE_OF = {
	episodes: 'episode',
	shoots: 'shootDay',
	parts: 'part',
	builds: 'build'
} as const satisfies Record<RecordSection, string>;

/** The channel of a record named in a page address, or undefined when there is no such record. */
async function channelOfRecord(section: RecordSection, id: string) {
	const row = await db
		.selectFrom(TABLE_OF[section])
		.select('channelId')
		.where('id', '=', id)
		.executeTakeFirst();
	return row?.channelId;
}

const RECORD_PAGE = new RegExp(`^/(${RECORD_SECTIONS.join('|')})/([^/]+)(?:/|$)`);

/**
 * A signed-in page request (or its client-side data request) for an episode, shoot day, part or
 * build of another channel the person works in switches to that channel and reloads the same
 * address with `?switched=<channel id>`, which the app layout turns into a notice. Anybody outside
 * the record's channel is left alone and gets the page's own 404, which names no channel. API
 * routes never switch: they stay in the token's or session's channel.
 */
export const channelLinkHandle: Handle = async ({ event, resolve }) => {
	const { person, channel, channels, via } = event.locals;
	if (
		(event.request.method !== 'GET' && event.request.method !== 'HEAD') ||
		via !== 'session' ||
		!person ||
		!channel ||
		channels.length < 2
	)
		return resolve(event);
	const match = RECORD_PAGE.exec(event.url.pathname);
	if (!match || !isUuid(match[2])) return resolve(event);
	const recordChannel = await channelOfRecord(match[1] as RecordSection, match[2]);
	if (!recordChannel || recordChannel === channel.id) return resolve(event);
	if (!channels.some((c) => c.id === recordChannel)) return resolve(event);
	await chooseChannel(event, person.id, recordChannel);
	const target = new URL(event.url);
	target.searchParams.set(SWITCHED_PARAM, recordChannel);
	redirect(303, target.pathname + target.search + target.hash);
};
