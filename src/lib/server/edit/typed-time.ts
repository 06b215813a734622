/**
 * The one reader of time a person types into a form or API field (a chapter start, a cut's
 * length, a note's or card's program time, a segment's recorded length).
 */
import { DomainError } from '../http/api';
import { readTypedTime } from '$lib/timecode';

/** The frame a typed time names; a typing mistake is a 400 in plain words on that field. */
export function frameFromTyped(field: string, read: () => number): number {
	const typed = readTypedTime(field, read);
	if (!typed.ok) throw new DomainError(400, typed.message, { [typed.field]: [typed.message] });
	return typed.frame;
}
