/**
 * Reading a typed chapter start. Pure module: no I/O, safe in the browser and on the server.
 */
import { defaultDropFrame, exactFps, parseTimecode, type FrameRate } from '../timecode';

// M:SS, H:MM:SS, with an optional decimal fraction: the clock forms parseTimecode accepts.
const CLOCK_TIME = /^(?:(\d+):)?(\d+):(\d{2})(?:\.(\d+))?$/;

/**
 * The frame a typed chapter start names. Timecode names its frame exactly (read drop-frame at
 * 29.97 and 59.94, as the page shows it). A clock time goes to the first frame at or after it,
 * not the nearest: description timestamps are cut off to the second, so "11:30" must not land
 * on 11:29.993 and be pasted as 11:29.
 */
export function chapterStartFromText(text: string, rate: FrameRate): number {
	const nearest = parseTimecode(text, rate, { dropFrame: defaultDropFrame(rate) });
	const clock = CLOCK_TIME.exec(String(text).trim());
	if (!clock) return nearest;
	const [, hours = '0', minutes, seconds, fraction = ''] = clock;
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
