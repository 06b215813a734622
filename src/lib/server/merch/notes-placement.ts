/**
 * Where a segment note sits: its segment, its take and the source time in it, and its program
 * time in the cut, read from what the person typed and checked against the episode.
 *
 * Times: program time is a frame of the cut at the episode's rate, typed as the episode's
 * programme timecode (its form, start offset taken off) or as a clock time (the first frame at or
 * after it, so a timestamp copied into a description never lands before the moment). Source time
 * is the take's camera timecode at the same rate, read and shown in the take's own form (drop-frame
 * when the take was logged with ";"), whichever separator the note's time is typed with.
 */
import { DomainError } from '../http/api';
import { frameFromTyped } from '../edit/typed-time';
import { isUuid } from '../auth/identity';
import { sql } from 'kysely';
import { db } from '../db';
import { episodeInChannel, type Executor } from '../episodes/episodes';
import { chapterStartFromText } from '$lib/chapters';
import {
	TimecodeError,
	formatTimecode,
	parseTimecodeInForm,
	type FrameRate,
	type ProgrammeClock
} from '$lib/timecode';
import type { NoteUpdate } from '$lib/schemas/parts';

/** The program frame the input names: undefined = unchanged, null = cleared. */
export function programFrameOf(
	input: Partial<NoteUpdate>,
	clock: ProgrammeClock,
	cutDurationFrames: number | null
): number | null | undefined {
	let frame: number | null | undefined = input.programFrame;
	if (input.programTime !== undefined) {
		frame =
			input.programTime === null || input.programTime === ''
				? null
				: frameFromTyped('programTime', () => chapterStartFromText(input.programTime!, clock));
	}
	if (
		frame !== null &&
		frame !== undefined &&
		cutDurationFrames !== null &&
		frame >= cutDurationFrames
	) {
		const message = `${clock.format(frame)} is past the end of the cut (${clock.format(cutDurationFrames)}); place the note inside the cut.`;
		throw new DomainError(400, message, { programTime: [message] });
	}
	return frame;
}

/** A source time typed as text, read once the take (and so its timecode form) is known. */
type SourceTime = { text: string } | number | null;

/** The source time the input names: undefined = unchanged, null = cleared. */
export function sourceTimeOf(input: Partial<NoteUpdate>): SourceTime | undefined {
	if (input.sourceTime !== undefined) {
		return input.sourceTime === null || input.sourceTime === '' ? null : { text: input.sourceTime };
	}
	return input.sourceFrame;
}

interface NoteSettings {
	segmentId: string | null;
	takeId: string | null;
	sourceFrame: number | null;
}

interface TakeSpan {
	clipName: string;
	sourceInFrames: number;
	sourceOutFrames: number;
	sourceDropFrame: boolean;
}

/** "BCAM_1007 runs 08:01:10;00–08:01:30;00" in the take's own timecode form. */
function takeRuns(take: TakeSpan, rate: FrameRate): string {
	const tc = (frames: number) => formatTimecode(frames, rate, { dropFrame: take.sourceDropFrame });
	return `${tc(take.sourceInFrames)}–${tc(take.sourceOutFrames)}`;
}

/** The frame a typed source time names, read in the take's form; a typing mistake names the take's range. */
function sourceFrameIn(take: TakeSpan, rate: FrameRate, source: SourceTime): number | null {
	if (source === null || typeof source === 'number') return source;
	try {
		return parseTimecodeInForm(source.text, rate, take.sourceDropFrame);
	} catch (failure) {
		if (!(failure instanceof TimecodeError)) throw failure;
		const message = `${failure.message} Take ${take.clipName} runs ${takeRuns(take, rate)}.`;
		throw new DomainError(400, message, { sourceTime: [message] });
	}
}

/**
 * Checks the segment and take belong to this episode and the source time falls inside the take;
 * a take without a segment puts the note in the take's segment.
 */
export async function checkPlacement(
	executor: Executor,
	episodeId: string,
	rate: FrameRate,
	settings: { segmentId: string | null; takeId: string | null; source: SourceTime }
): Promise<NoteSettings> {
	let { segmentId } = settings;
	const { takeId, source } = settings;
	if (segmentId !== null) {
		const segment = isUuid(segmentId)
			? await executor
					.selectFrom('segment')
					.select('id')
					.where('id', '=', segmentId)
					.where('episodeId', '=', episodeId)
					.executeTakeFirst()
			: undefined;
		if (!segment)
			throw new DomainError(
				400,
				'That segment is not in this episode’s rundown; pick one from the list.',
				{ segmentId: ['That segment is not in this episode’s rundown.'] }
			);
	}
	if (takeId === null) {
		if (source !== null)
			throw new DomainError(400, 'A source time belongs to a take: pick the take it is in.', {
				takeId: ['Pick the take the source time is in.']
			});
		return { segmentId, takeId, sourceFrame: null };
	}
	const take = await executor
		.selectFrom('take')
		.innerJoin('shot', 'shot.id', 'take.shotId')
		.innerJoin('segment', 'segment.id', 'shot.segmentId')
		.select([
			'take.clipName',
			'take.sourceInFrames',
			'take.sourceOutFrames',
			'take.sourceDropFrame',
			'shot.segmentId',
			'segment.position'
		])
		.where('take.id', '=', takeId)
		.where('segment.episodeId', '=', episodeId)
		.executeTakeFirst();
	if (!take)
		throw new DomainError(
			400,
			'That take is not in this episode’s shot list; pick one from the list.',
			{ takeId: ['That take is not in this episode’s shot list.'] }
		);
	if (segmentId === null) segmentId = take.segmentId;
	else if (segmentId !== take.segmentId) {
		const message = `Take ${take.clipName} was shot for segment ${take.position}; pick that segment or another take.`;
		throw new DomainError(400, message, { takeId: [message] });
	}
	const sourceFrame = sourceFrameIn(take, rate, source);
	if (
		sourceFrame !== null &&
		(sourceFrame < take.sourceInFrames || sourceFrame > take.sourceOutFrames)
	) {
		const shown = formatTimecode(sourceFrame, rate, { dropFrame: take.sourceDropFrame });
		const message = `${shown} is outside take ${take.clipName} (${takeRuns(take, rate)}); type a source time inside the take.`;
		throw new DomainError(400, message, { sourceTime: [message] });
	}
	return { segmentId, takeId, sourceFrame };
}

/**
 * The take a note's form names by clip name (the take picker's text field, which is all a browser
 * without JavaScript sends): `takeId` when the form sent no clip name field; none when the field
 * is empty; the picked `takeId` when its clip name is the one typed (two takes may share a name);
 * otherwise the one take of this episode with that clip name (case-insensitive), looked for in the
 * note's segment first. No take or several of that name is a 400 on `takeId` in the crew's words.
 */
export async function takeOfTypedClip(
	channelId: string,
	episodeId: string,
	typed: { takeClip?: string; takeId?: string | null; segmentId?: string | null },
	executor: Executor = db
): Promise<string | null | undefined> {
	if (typed.takeClip === undefined) return typed.takeId;
	const clipName = typed.takeClip.trim();
	if (clipName === '') return null;
	const episode = await episodeInChannel(channelId, episodeId, executor);
	const named = await executor
		.selectFrom('take')
		.innerJoin('shot', 'shot.id', 'take.shotId')
		.innerJoin('segment', 'segment.id', 'shot.segmentId')
		.select(['take.id', 'shot.segmentId'])
		.where('segment.episodeId', '=', episode.id)
		.where(sql<string>`lower(take.clip_name)`, '=', clipName.toLowerCase())
		.orderBy('take.id')
		.limit(50)
		.execute();
	if (typed.takeId && named.some((take) => take.id === typed.takeId)) return typed.takeId;
	const inSegment = typed.segmentId
		? named.filter((take) => take.segmentId === typed.segmentId)
		: [];
	const candidates = inSegment.length ? inSegment : named;
	if (candidates.length === 1) return candidates[0].id;
	const message =
		candidates.length === 0
			? `No take of this episode is named “${clipName}”. Check the clip name on the shot list, or leave the take empty.`
			: `${candidates.length} takes of this episode are named “${clipName}”. Pick the segment it was shot for, or pick the take from the list as you type.`;
	throw new DomainError(400, message, { takeId: [message] });
}
