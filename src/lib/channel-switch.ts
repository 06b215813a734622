/** Opening a record of another of one's channels switches to it; the page then says so. */

/** The query parameter the switch adds to the address: the id of the channel switched to. */
export const SWITCHED_PARAM = 'switched';

/** Page sections whose second path segment is a record of one channel. */
export const RECORD_SECTIONS = ['episodes', 'shoots', 'parts', 'builds'] as const;
export type RecordSection = (typeof RECORD_SECTIONS)[number];

const RECORD_WORDS: Record<RecordSection, string> = {
	episodes: 'this episode',
	shoots: 'this shoot day',
	parts: 'this part',
	builds: 'this build'
};

/**
 * The notice for an address the server switched channel for, or null. Only when the flag names
 * the channel now current, so a copied address with a stale flag says nothing.
 */
export function channelSwitchNotice(
	url: URL,
	channel: { id: string; name: string }
): string | null {
	if (url.searchParams.get(SWITCHED_PARAM) !== channel.id) return null;
	const section = url.pathname.split('/')[1] as RecordSection;
	const what = RECORD_WORDS[section] ?? 'this page';
	return `Switched to ${channel.name} to open ${what}.`;
}
