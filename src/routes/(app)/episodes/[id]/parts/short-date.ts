import { dateFormat } from '$lib/date-format';

/** A UTC day ("2026-12-03") as the clicks panel shows it: "Dec 3". */
export const shortDate = (day: string) =>
	dateFormat({ month: 'short', day: 'numeric', timeZone: 'UTC' }).format(
		new Date(`${day}T00:00:00Z`)
	);
