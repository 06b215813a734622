/**
 * Checks an episode's programme timecode setting (drop-frame or non-drop, start label) against its
 * frame rate before it is stored; a mistake is a 400 on its field. Reading and showing programme
 * time is `programmeClock` in $lib/timecode.
 */
import { DomainError } from '../http/api';
import {
	TimecodeError,
	isDropFrameCapable,
	programmeTimecode,
	timecodeStartFrame,
	type FrameRate,
	type ProgrammeClock,
	programmeClock
} from '$lib/timecode';

/** The stored columns, checked: `timecodeStart` always with a colon before the frames. */
export function checkedProgrammeTimecode(
	frameRate: FrameRate,
	timecodeDropFrame: boolean | null,
	timecodeStart: string
): { timecodeDropFrame: boolean | null; timecodeStart: string } {
	if (timecodeDropFrame === true && !isDropFrameCapable(frameRate)) {
		const message = `Drop-frame timecode only exists at 29.97 and 59.94 fps; at ${frameRate} fps pick non-drop.`;
		throw new DomainError(400, message, { timecodeDropFrame: [message] });
	}
	const start = timecodeStart.trim().replace(/;(\d{2})$/, ':$1');
	try {
		const { dropFrame } = programmeTimecode({ frameRate, timecodeDropFrame });
		timecodeStartFrame(start, frameRate, dropFrame);
	} catch (failure) {
		if (!(failure instanceof TimecodeError)) throw failure;
		throw new DomainError(400, failure.message, { timecodeStart: [failure.message] });
	}
	return { timecodeDropFrame, timecodeStart: start };
}

/** The programme clock of an episode row (its rate, drop-frame choice and start). */
export function clockOfEpisode(episode: {
	frameRate: FrameRate;
	timecodeDropFrame: boolean | null;
	timecodeStart: string;
}): ProgrammeClock {
	return programmeClock(programmeTimecode(episode));
}
