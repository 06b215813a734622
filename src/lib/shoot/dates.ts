/** A shoot day's date as the day page and the call sheet print it. Pure module, no I/O. */

const LONG_DATE = new Intl.DateTimeFormat('en', {
	weekday: 'long',
	day: 'numeric',
	month: 'long',
	year: 'numeric',
	timeZone: 'UTC'
});

/** "Tuesday, December 8, 2026" for the stored date "2026-12-08"; read as UTC so no time zone moves the day. */
export const longShootDate = (shootDate: string): string =>
	LONG_DATE.format(new Date(shootDate + 'T00:00:00Z'));
