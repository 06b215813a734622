/**
 * What the timeline shows besides chapters, and the keys it answers to. Pure: shared by the
 * Timeline components, the edit page's key guide and the tests.
 */

/** Kinds of marks other work feeds the timeline: cautions, segment notes, featured parts, spec cards, review comments. */
export type TimelineMarkKind = 'caution' | 'note' | 'part' | 'spec-card' | 'comment';

/** One mark at a frame of the cut; `href` makes it a link to where the mark is edited. */
export interface TimelineMark {
	kind: TimelineMarkKind;
	atFrame: number;
	label: string;
	href?: string;
}

/** The lanes in the order they are drawn, with the words of the legend. */
export const MARK_KINDS: readonly { kind: TimelineMarkKind; lane: string; legend: string }[] = [
	{ kind: 'caution', lane: 'Cautions', legend: 'Caution card on screen' },
	{ kind: 'note', lane: 'Notes', legend: 'Segment note' },
	{ kind: 'part', lane: 'Parts', legend: 'Featured part appears' },
	{ kind: 'spec-card', lane: 'Spec cards', legend: 'Spec card on screen' },
	{ kind: 'comment', lane: 'Review', legend: 'Open review comment on the current version' }
];

/** A chapter span as the timeline draws it. */
export interface TimelineChapter {
	id: string;
	startFrame: number;
	title: string;
	/** True when a chapter rule flags this chapter. */
	flagged: boolean;
}

/** A rundown segment's span in the cut as the timeline draws it; unplaced ones are not drawn. */
export interface TimelineSegment {
	id: string;
	position: number;
	title: string;
	inFrame: number | null;
	outFrame: number | null;
	/** Flagged hazards: the span is drawn with the caution colour. */
	hazards: readonly string[];
}

export type TimelineAction =
	| { kind: 'seek-seconds'; seconds: number }
	| { kind: 'seek-frames'; frames: number }
	| { kind: 'seek-start' }
	| { kind: 'seek-end' }
	| { kind: 'previous-chapter' }
	| { kind: 'next-chapter' }
	| { kind: 'mark' }
	| { kind: 'move' }
	| { kind: 'rename' }
	| { kind: 'remove' }
	| { kind: 'restore' }
	| { kind: 'play' };

/** The key guide shown on the page; keyAction below is the one place that implements it. */
export const TIMELINE_KEYS: readonly { keys: string[]; does: string }[] = [
	{ keys: ['←', '→'], does: 'playhead back / forward one second' },
	{ keys: ['Shift ←', 'Shift →'], does: 'ten seconds' },
	{ keys: [',', '.'], does: 'one frame' },
	{ keys: ['Home', 'End'], does: 'start / end of the cut' },
	{ keys: ['[', ']'], does: 'previous / next chapter (selects it)' },
	{ keys: ['M'], does: 'mark a chapter at the playhead' },
	{ keys: ['Shift M'], does: 'move the selected chapter to the playhead' },
	{ keys: ['Enter'], does: 'rename the selected chapter' },
	{ keys: ['Delete'], does: 'remove the selected chapter' },
	{ keys: ['Z'], does: 'put the last removed chapter back' },
	{ keys: ['Space'], does: 'play / pause the cut (when it is uploaded)' }
];

/** The timeline action for a key press, or null to let the browser have the key. */
export function keyAction(
	event: Pick<KeyboardEvent, 'key' | 'shiftKey' | 'ctrlKey' | 'metaKey' | 'altKey'>
): TimelineAction | null {
	const modified = event.ctrlKey || event.metaKey || event.altKey;
	if (modified) return null; // leave the browser's and the screen reader's shortcuts alone
	switch (event.key) {
		case 'ArrowLeft':
			return { kind: 'seek-seconds', seconds: event.shiftKey ? -10 : -1 };
		case 'ArrowRight':
			return { kind: 'seek-seconds', seconds: event.shiftKey ? 10 : 1 };
		case ',':
			return { kind: 'seek-frames', frames: -1 };
		case '.':
			return { kind: 'seek-frames', frames: 1 };
		case 'Home':
			return { kind: 'seek-start' };
		case 'End':
			return { kind: 'seek-end' };
		case '[':
			return { kind: 'previous-chapter' };
		case ']':
			return { kind: 'next-chapter' };
		case 'm':
		case 'M':
			return event.shiftKey ? { kind: 'move' } : { kind: 'mark' };
		case 'Enter':
			return { kind: 'rename' };
		case 'Delete':
		case 'Backspace':
			return { kind: 'remove' };
		case 'z':
		case 'Z':
			return { kind: 'restore' };
		case ' ':
			return { kind: 'play' };
		default:
			return null;
	}
}

/** Seconds between labelled ruler ticks: the finest step that leaves at least `minimumPixels` between labels. */
export function rulerStepSeconds(
	durationSeconds: number,
	trackPixels: number,
	minimumPixels = 72
): number {
	const steps = [1, 2, 5, 10, 15, 30, 60, 120, 300, 600, 900, 1800, 3600, 7200];
	if (durationSeconds <= 0 || trackPixels <= 0) return steps[steps.length - 1];
	const pixelsPerSecond = trackPixels / durationSeconds;
	return steps.find((step) => step * pixelsPerSecond >= minimumPixels) ?? steps[steps.length - 1];
}

/** Position of a frame along the cut as a percentage, kept inside 0–100. */
export function percentAlong(frame: number, durationFrames: number): number {
	if (durationFrames <= 0) return 0;
	return Math.min(100, Math.max(0, (frame / durationFrames) * 100));
}
