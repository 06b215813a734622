/**
 * The kinds of segment a rundown is made of (our own list), and small helpers for the rundown's
 * totals. Pure; shared by the rundown page, the script editor and the server.
 */

export const SEGMENT_KINDS = [
	'cold-open',
	'overview',
	'parts-bench',
	'install-step',
	'wheels-tyres',
	'test-drive',
	'tips',
	'call-to-action',
	'teaser'
] as const;

export type SegmentKind = (typeof SEGMENT_KINDS)[number];

export interface SegmentKindInfo {
	label: string;
	/** What the kind is for, shown as a hint when picking it. */
	hint: string;
	/** Whether a new segment of this kind starts out needing footage (it can be changed). */
	needsFootage: boolean;
}

export const SEGMENT_KIND_INFO: Record<SegmentKind, SegmentKindInfo> = {
	'cold-open': {
		label: 'Cold open',
		hint: 'The hook before the title: the finished result or the problem.',
		needsFootage: true
	},
	overview: {
		label: 'Overview',
		hint: 'What we are doing today, to which build, and why.',
		needsFootage: true
	},
	'parts-bench': {
		label: 'Parts on the bench',
		hint: 'The parts and tools laid out before the work starts.',
		needsFootage: true
	},
	'install-step': {
		label: 'Install step',
		hint: 'One step of the work, start to finish.',
		needsFootage: true
	},
	'wheels-tyres': {
		label: 'Wheels and tyres',
		hint: 'Mounting, fitment and the numbers behind a wheel or tyre change.',
		needsFootage: true
	},
	'test-drive': {
		label: 'Test drive',
		hint: 'The result on the road or the trail.',
		needsFootage: true
	},
	tips: { label: 'Tips', hint: 'What we learned, what to watch for.', needsFootage: true },
	'call-to-action': {
		label: 'Call to action',
		hint: 'Subscribe, the shop, the contact: usually read over an end card.',
		needsFootage: false
	},
	teaser: {
		label: 'Teaser',
		hint: 'A glimpse of a future episode: it can promise a follow-up.',
		needsFootage: false
	}
};

export function isSegmentKind(value: unknown): value is SegmentKind {
	return typeof value === 'string' && (SEGMENT_KINDS as readonly string[]).includes(value);
}

/** A duration in seconds as the crew reads it: `45 s`, `3:05`, `1:02:10`. */
export function formatDuration(totalSeconds: number): string {
	const rounded = Math.max(0, Math.round(totalSeconds));
	const hours = Math.floor(rounded / 3600);
	const minutes = Math.floor((rounded % 3600) / 60);
	const seconds = rounded % 60;
	if (hours > 0)
		return `${hours}:${String(minutes).padStart(2, '0')}:${String(seconds).padStart(2, '0')}`;
	if (minutes > 0) return `${minutes}:${String(seconds).padStart(2, '0')}`;
	return `${seconds} s`;
}

/** A signed difference for "over/under": `+42 s over`, `1:10 under`, `on target`. */
export function describeBalance(deltaSeconds: number, state: 'under' | 'on' | 'over'): string {
	const size = formatDuration(Math.abs(deltaSeconds));
	if (state === 'on')
		return Math.round(deltaSeconds) === 0
			? 'on target'
			: `on target (${deltaSeconds > 0 ? '+' : '−'}${size})`;
	return state === 'over' ? `${size} over` : `${size} under`;
}

/**
 * Reads a planned duration typed as seconds (`90`), minutes and seconds (`1:30`), or with units
 * (`1m30s`, `90 s`, `2 min`). Returns null for anything else, including negative values.
 */
export function parseDurationText(text: string): number | null {
	const trimmed = text.trim().toLowerCase();
	if (trimmed === '') return null;
	if (/^\d+$/.test(trimmed)) return Number(trimmed);
	const clock = /^(?:(\d+):)?(\d+):(\d{2})$/.exec(trimmed);
	if (clock) {
		const [, hours, minutes, seconds] = clock;
		if (Number(seconds) >= 60 || (hours !== undefined && Number(minutes) >= 60)) return null;
		return Number(hours ?? 0) * 3600 + Number(minutes) * 60 + Number(seconds);
	}
	const units =
		/^(?:(\d+)\s*(?:m|min|mins|minutes?))?\s*(?:(\d+)\s*(?:s|sec|secs|seconds?))?$/.exec(trimmed);
	if (units && (units[1] !== undefined || units[2] !== undefined))
		return Number(units[1] ?? 0) * 60 + Number(units[2] ?? 0);
	return null;
}
