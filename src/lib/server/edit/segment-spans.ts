/**
 * Where each rundown segment sits in the cut: its in and out points on the edit timeline
 * (programme frames at the episode's rate, out exclusive), set by the editor or a producer. The
 * lock gate checks each caution card of a flagged segment against its segment's span
 * ($lib/gates). Every function takes the channel id; a segment of another channel is "not found".
 * A change names the segment's version (409 with the current span when stale).
 */
import { db } from '../db';
import { DomainError } from '../http/api';
import { episodeInChannel, type Executor } from '../episodes/episodes';
import { segmentInChannel } from '../episodes/segment-in-channel';
import { frameFromTyped } from './typed-time';
import type { ProgrammeClock } from '$lib/timecode';
import { clockOfEpisode } from '../episodes/programme-timecode';
import { editLocks, type Stage } from '$lib/stages';
import type { HazardId } from '$lib/cautions';
import type { SegmentSpanUpdate } from '$lib/schemas/edit';

export interface SegmentSpan {
	id: string;
	position: number;
	title: string;
	hazards: HazardId[];
	/** In and out points in frames (out exclusive) and as timecode; null until placed. */
	inFrame: number | null;
	outFrame: number | null;
	inTimecode: string | null;
	outTimecode: string | null;
	version: number;
}

function spanView(
	row: {
		id: string;
		position: number;
		title: string;
		hazards: HazardId[];
		cutInFrame: number | null;
		cutOutFrame: number | null;
		version: number;
	},
	clock: ProgrammeClock
): SegmentSpan {
	return {
		id: row.id,
		position: row.position,
		title: row.title,
		hazards: row.hazards,
		inFrame: row.cutInFrame,
		outFrame: row.cutOutFrame,
		inTimecode: row.cutInFrame === null ? null : clock.format(row.cutInFrame),
		outTimecode: row.cutOutFrame === null ? null : clock.format(row.cutOutFrame),
		version: row.version
	};
}

/** The episode's segments in rundown order with their spans; 404 for another channel's episode. */
export async function segmentSpansFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<SegmentSpan[]> {
	const episode = await episodeInChannel(channelId, episodeId, executor);
	const rows = await executor
		.selectFrom('segment')
		.select(['id', 'position', 'title', 'hazards', 'cutInFrame', 'cutOutFrame', 'version'])
		.where('episodeId', '=', episode.id)
		.orderBy('position')
		.execute();
	const clock = clockOfEpisode(episode);
	return rows.map((row) => spanView(row, clock));
}

/**
 * Sets (or clears, with both ends empty) a segment's in and out points. Every mistake is a 400 on
 * its field, all at once: a typing mistake, no cut length yet, out not after in, a point past the
 * cut's end. 409 once the picture is locked, or when the segment changed since it was read.
 */
export async function setSegmentSpan(
	channelId: string,
	segmentId: string,
	input: SegmentSpanUpdate
): Promise<SegmentSpan> {
	return db.transaction().execute(async (trx) => {
		const segment = await segmentInChannel(trx, channelId, segmentId, { lock: true });
		const clock = clockOfEpisode(segment);
		if (editLocks(segment.stage as Stage).cut)
			throw new DomainError(
				409,
				'The picture is locked, so where each segment sits in the cut is final. A producer can move the episode back to Edit to change it.'
			);
		if (segment.version !== input.version)
			throw new DomainError(
				409,
				'Someone changed this segment while you were working on it. Its current in and out points are shown; type yours again.',
				undefined,
				{ current: spanView(segment, clock) }
			);
		let inFrame: number | null = null;
		let outFrame: number | null = null;
		if (input.in !== '' || input.out !== '') {
			const issues: Record<string, string[]> = {};
			const read = (field: 'in' | 'out', typed: string) => {
				try {
					return frameFromTyped(field, () => clock.parse(typed));
				} catch (failure) {
					if (!(failure instanceof DomainError) || !failure.issues) throw failure;
					Object.assign(issues, failure.issues);
					return null;
				}
			};
			inFrame = read('in', input.in);
			outFrame = read('out', input.out);
			const cut = segment.cutDurationFrames;
			const at = (frame: number) => clock.format(frame);
			if (cut === null) {
				issues.in ??= [
					'The cut has no length yet: set how long the cut runs first, then place the segments in it.'
				];
			} else {
				if (inFrame !== null && inFrame >= cut)
					issues.in ??= [
						`The in point ${at(inFrame)} is at or after the end of the cut (${at(cut)}): place the segment inside the cut.`
					];
				if (outFrame !== null && outFrame > cut)
					issues.out ??= [
						`The out point ${at(outFrame)} is after the end of the cut (${at(cut)}): the segment has to end by ${at(cut)}.`
					];
			}
			if (inFrame !== null && outFrame !== null && outFrame <= inFrame)
				issues.out ??= [
					`The out point ${at(outFrame)} has to come after the in point ${at(inFrame)}.`
				];
			const fields = Object.keys(issues);
			if (fields.length > 0) throw new DomainError(400, issues[fields[0]][0], issues);
		}
		const updated = await trx
			.updateTable('segment')
			.set({
				cutInFrame: inFrame,
				cutOutFrame: outFrame,
				version: segment.version + 1,
				updatedAt: new Date()
			})
			.where('id', '=', segment.id)
			.returning(['id', 'position', 'title', 'hazards', 'cutInFrame', 'cutOutFrame', 'version'])
			.executeTakeFirstOrThrow();
		return spanView(updated, clock);
	});
}
