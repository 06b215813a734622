/**
 * Caution cards: the caution of every hazard a segment is flagged with, its words (the host's or a
 * producer's), its place in the cut and its time on screen (the editor's or a producer's), and the
 * placed ones as marks on the edit timeline. A time on screen shorter than the words need to be
 * read ($lib/reading-time) is refused on save; words changed later that outgrow a time already set
 * are kept (the host can't change the time), and the lock gate names the card until the editor
 * shows it longer. A caution carries a version; a save that names a stale one answers 409 with
 * the current caution in `current`.
 */
import { error } from '@sveltejs/kit';
import { sql } from 'kysely';
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { episodeInChannel, type Actor, type Executor } from './episodes';
import { segmentInChannel } from './segment-in-channel';
import { episodeOpenFor } from './stage-locks';
import { positionFromText } from './typed-timecode';
import { clockOfEpisode } from './programme-timecode';
import { HAZARDS, hazardById, isHazardId, type HazardId } from '$lib/cautions';
import {
	READING_CHARACTERS_PER_SECOND,
	readableCharacters,
	readingSeconds
} from '$lib/reading-time';
import { formatClock, framesToSeconds, secondsToFrames, type ProgrammeClock } from '$lib/timecode';
import type { CautionUpdate } from '$lib/schemas/episodes';
import type { Role } from '../db/types';

export interface CautionView {
	id: string;
	hazard: HazardId;
	label: string;
	text: string;
	defaultText: string;
	atFrame: number | null;
	/** The episode's programme timecode (its form and start offset), null when not placed. */
	atTimecode: string | null;
	atClock: string | null;
	/** Time on screen in frames and seconds; null until set. */
	durationFrames: number | null;
	durationSeconds: number | null;
	/** Whole seconds the words need to be read (about 17 characters a second). */
	neededSeconds: number;
	version: number;
}

export const hazardOrder = new Map(HAZARDS.map((hazard, index) => [hazard.id, index]));

/** Flags are stored once each, in the fixed hazard order, so the gate names them in the order the page shows. */
export function inHazardOrder(hazards: readonly HazardId[]): HazardId[] {
	return [...new Set(hazards)].sort(
		(a, b) => (hazardOrder.get(a) ?? 0) - (hazardOrder.get(b) ?? 0)
	);
}

export function cautionView(
	row: {
		id: string;
		hazard: HazardId;
		text: string;
		atFrame: number | null;
		durationFrames: number | null;
		version: number;
	},
	programme: ProgrammeClock
): CautionView {
	const rate = programme.rate;
	const hazard = hazardById(row.hazard);
	return {
		id: row.id,
		hazard: row.hazard,
		label: hazard?.label ?? row.hazard,
		text: row.text,
		defaultText: hazard?.defaultCaution ?? '',
		atFrame: row.atFrame,
		atTimecode: row.atFrame === null ? null : programme.format(row.atFrame),
		atClock:
			row.atFrame === null
				? null
				: formatClock(framesToSeconds(row.atFrame, rate), { millis: true }),
		durationFrames: row.durationFrames,
		durationSeconds:
			row.durationFrames === null
				? null
				: Math.round(framesToSeconds(row.durationFrames, rate) * 10) / 10,
		neededSeconds: readingSeconds(row.text),
		version: row.version
	};
}

/** Makes sure every flagged hazard has a caution row, starting from the default wording. */
export async function ensureCautions(
	executor: Executor,
	segmentId: string,
	hazards: readonly HazardId[]
): Promise<void> {
	if (hazards.length === 0) return;
	await executor
		.insertInto('caution')
		.values(
			hazards.map((hazard) => ({ segmentId, hazard, text: hazardById(hazard).defaultCaution }))
		)
		.onConflict((conflict) => conflict.columns(['segmentId', 'hazard']).doNothing())
		.execute();
}

/** Who may change which part of a caution: the words are the writers', the placement the editor's. */
const CAUTION_TEXT_ROLES: readonly Role[] = ['producer', 'host'];
const CAUTION_PLACE_ROLES: readonly Role[] = ['producer', 'editor'];

/** Edits a caution's text and/or places it in the cut (typed timecode or clock time at the episode's rate). */
export async function updateCaution(
	channelId: string,
	actor: Actor,
	segmentId: string,
	hazard: string,
	input: CautionUpdate
): Promise<CautionView> {
	if (!isHazardId(hazard)) throw notFound('That caution');
	const changesText = input.text !== undefined;
	const changesPlace =
		input.at !== undefined || input.atFrame !== undefined || input.seconds !== undefined;
	if (changesText && !CAUTION_TEXT_ROLES.some((role) => actor.roles.includes(role)))
		error(
			403,
			'The caution’s words are the host’s or a producer’s to change. You can place it in the cut.'
		);
	if (changesPlace && !CAUTION_PLACE_ROLES.some((role) => actor.roles.includes(role)))
		error(
			403,
			'Placing a caution in the cut is the editor’s or a producer’s job. You can change its words.'
		);
	return db.transaction().execute(async (trx) => {
		await episodeOpenFor(trx, channelId, 'cards', { segmentId });
		const segment = await segmentInChannel(trx, channelId, segmentId);
		const programme = clockOfEpisode(segment);
		const rate = programme.rate;
		const caution = await trx
			.selectFrom('caution')
			.selectAll()
			.where('segmentId', '=', segmentId)
			.where('hazard', '=', hazard)
			.forUpdate()
			.executeTakeFirst();
		if (!caution || !segment.hazards.includes(hazard)) throw notFound('That caution');
		if (caution.version !== input.version) {
			throw new DomainError(
				409,
				'Someone changed this caution while you were editing. Their version is shown; yours is still in the form.',
				undefined,
				{ current: cautionView(caution, programme) }
			);
		}
		let atFrame = caution.atFrame;
		if (input.atFrame !== undefined) atFrame = input.atFrame;
		else if (input.at !== undefined)
			atFrame =
				input.at === null || input.at === '' ? null : positionFromText(input.at, programme, 'at');
		if (
			atFrame !== null &&
			segment.cutDurationFrames !== null &&
			atFrame >= segment.cutDurationFrames
		) {
			const message = `${programme.format(atFrame)} is after the end of the cut (${programme.format(segment.cutDurationFrames)}): place the caution inside the cut.`;
			throw new DomainError(400, message, { at: [message] });
		}
		const text = input.text ?? caution.text;
		let durationFrames = caution.durationFrames;
		if (input.seconds !== undefined) {
			durationFrames = input.seconds === null ? null : secondsToFrames(input.seconds, rate);
			const needed = readingSeconds(text);
			if (durationFrames !== null && durationFrames < secondsToFrames(needed, rate)) {
				const message = `These words need ${needed} s on screen to be read (${readableCharacters(text)} characters at about ${READING_CHARACTERS_PER_SECOND} a second): show the card for at least ${needed} s, or shorten the words.`;
				throw new DomainError(400, message, { seconds: [message] });
			}
		}
		const updated = await trx
			.updateTable('caution')
			.set({
				text,
				atFrame,
				durationFrames,
				version: caution.version + 1,
				updatedAt: new Date()
			})
			.where('id', '=', caution.id)
			.returningAll()
			.executeTakeFirstOrThrow();
		return cautionView(updated, programme);
	});
}

/**
 * The placed cautions of an episode as marks for the edit timeline (shape of TimelineMark in
 * src/lib/components/timeline.ts: kind, atFrame, label, href). Unplaced ones are left out: the lock
 * gate names them instead.
 */
export async function cautionMarksFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
) {
	const episode = await episodeInChannel(channelId, episodeId, executor);
	const rows = await executor
		.selectFrom('caution')
		.innerJoin('segment', 'segment.id', 'caution.segmentId')
		.select([
			'caution.hazard',
			'caution.atFrame',
			'segment.id as segmentId',
			'segment.position',
			'segment.title'
		])
		.where('segment.episodeId', '=', episode.id)
		.where('caution.atFrame', 'is not', null)
		.where(sql<boolean>`caution.hazard = ANY(segment.hazards)`)
		.orderBy('caution.atFrame')
		.execute();
	return rows.map((row) => ({
		kind: 'caution' as const,
		atFrame: row.atFrame!,
		label: `${hazardById(row.hazard)?.label ?? row.hazard} · segment ${row.position} “${row.title}”`,
		href: `/episodes/${episode.id}/rundown/${row.segmentId}`
	}));
}
