/**
 * Typed timecode or clock text read at an episode's frame rate, for every form and route that takes a
 * time in the cut (segments, cautions). A typo answers 400 naming the field.
 */
import { frameFromTyped } from '../edit/typed-time';
import { parseTypedTime, type FrameRate } from '$lib/timecode';

/** Reads typed timecode or clock text at the episode's rate the way the pages show it (drop-frame at 29.97/59.94). */
export function framesFromText(text: string, rate: FrameRate, field: string): number {
	return frameFromTyped(field, () => parseTypedTime(text, rate));
}
