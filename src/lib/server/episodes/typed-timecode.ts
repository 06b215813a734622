/**
 * Typed timecode or clock text read in an episode's programme timecode, for every form and route
 * that takes a time in the cut (cautions) or a length (a segment's recorded length). A typo answers
 * 400 naming the field.
 */
import { frameFromTyped } from '../edit/typed-time';
import type { ProgrammeClock } from '$lib/timecode';

/** A position in the cut: timecode in the episode's form with its start taken off, or a clock time from 0. */
export function positionFromText(text: string, programme: ProgrammeClock, field: string): number {
	return frameFromTyped(field, () => programme.parse(text));
}

/** A length: timecode in the episode's form (no start offset), or a clock time. */
export function lengthFromText(text: string, programme: ProgrammeClock, field: string): number {
	return frameFromTyped(field, () => programme.parseLength(text));
}
