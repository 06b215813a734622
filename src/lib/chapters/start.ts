/**
 * Reading a typed chapter start. Pure module: no I/O, safe in the browser and on the server.
 */
import { clockOrUsual, exactFps, type FrameRate, type ProgrammeClock } from '../timecode';

// M:SS, H:MM:SS, with an optional decimal fraction: the clock forms parseTimecode accepts.
const CLOCK_TIME = /^(?:(\d+):)?(\d+):(\d{2})(?:\.(\d+))?$/;

/**
 * The frame a typed chapter start names. Timecode names its frame exactly (read in the episode's
 * programme timecode, start offset taken off; a bare rate means the usual form from 00:00:00:00).
 * A clock time counts from the start of the cut and goes to the first frame at or after it, not
 * the nearest: description timestamps are cut off to the second, so "11:30" must not land on
 * 11:29.993 and be pasted as 11:29.
 */
export function chapterStartFromText(
	text: string,
	clockOrRate: ProgrammeClock | FrameRate
): number {
	const clock = clockOrUsual(clockOrRate);
	const rate = clock.rate;
	const nearest = clock.parse(text);
	const typedClock = CLOCK_TIME.exec(String(text).trim());
	if (!typedClock) return nearest;
	const [, hours = '0', minutes, seconds, fraction = ''] = typedClock;
	const scale = 10n ** BigInt(fraction.length);
	const typedScaled =
		(BigInt(hours) * 3600n + BigInt(minutes) * 60n + BigInt(seconds)) * scale +
		BigInt(fraction || '0');
	const { numerator, denominator } = exactFps(rate);
	// Frame n starts at n·den/num seconds; compare in integers so no rounding can decide it.
	const startsBeforeTyped =
		BigInt(nearest) * BigInt(denominator) * scale < typedScaled * BigInt(numerator);
	return startsBeforeTyped ? nearest + 1 : nearest;
}
