/**
 * Spec cards: the numbers an episode puts on screen (tyre sizes, tyre changes, torque, lift, free
 * text), attached to a rundown segment and placed at a program time in the cut.
 *
 * The lines on screen are never stored: they are rendered from the stored input with
 * renderSpecCard ($lib/specs) every time they are read, so a card always shows what the spec
 * modules compute. Every function takes the channel id and filters by it; a card or episode of
 * another channel is "not found". Cards carry a version; a change that names a stale one answers
 * 409 with the current card.
 */
import { sql } from 'kysely';
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import { episodeInChannel, type Executor } from '../episodes/episodes';
import { episodeOpenFor } from '../episodes/stage-locks';
import { frameFromTyped } from './typed-time';
import type { SpecCard, SpecCardInput } from '$lib/specs';
import {
	READING_CHARACTERS_PER_SECOND,
	onScreenText,
	readableCharacters,
	readingSeconds
} from '$lib/reading-time';
import type { SpecCardBoard, SpecCardSegment, SpecCardView } from '$lib/specs/board';
import {
	specCardExportRows,
	specCardsCsv,
	specCardsJson,
	type SpecCardExportRow
} from '$lib/specs/export';
import {
	clockOfHeading,
	framesToMilliseconds,
	secondsToFrames,
	type FrameRate,
	type ProgrammeClock
} from '$lib/timecode';
import { clockOfEpisode } from '../episodes/programme-timecode';
import {
	DEFAULT_ON_SCREEN_SECONDS,
	ON_SCREEN_SECONDS_LIMITS,
	SPEC_CARD_KIND_LABELS,
	checkSpecCard,
	type SpecCardCreate,
	type SpecCardExportFormat,
	type SpecCardUpdate
} from '$lib/schemas/spec-cards';

const cardNotFound = () => notFound('That spec card');

type Episode = Awaited<ReturnType<typeof episodeInChannel>>;

function cardsQuery(executor: Executor, episodeId: string) {
	return (
		executor
			.selectFrom('specCard')
			.leftJoin('segment', 'segment.id', 'specCard.segmentId')
			.leftJoin('person', 'person.id', 'specCard.createdBy')
			.select([
				'specCard.id',
				'specCard.kind',
				'specCard.input',
				'specCard.atFrame',
				'specCard.durationFrames',
				'specCard.position',
				'specCard.version',
				'specCard.updatedAt',
				'segment.id as segmentId',
				'segment.position as segmentPosition',
				'segment.title as segmentTitle',
				'person.name as createdByName'
			])
			.where('specCard.episodeId', '=', episodeId)
			// Program-time order; cards not placed yet come last, in the order they were made.
			.orderBy(sql`spec_card.at_frame ASC NULLS LAST`)
			.orderBy('specCard.position')
	);
}

type CardRow = Awaited<ReturnType<ReturnType<typeof cardsQuery>['execute']>>[number];

/** The default time on screen in frames at the episode's rate. */
const defaultDurationFrames = (rate: FrameRate) => secondsToFrames(DEFAULT_ON_SCREEN_SECONDS, rate);

function toView(row: CardRow, episode: Episode, rate: FrameRate): SpecCardView {
	const checked = checkSpecCard(row.input);
	const durationFrames = row.durationFrames ?? defaultDurationFrames(rate);
	return {
		id: row.id,
		kind: row.kind,
		kindLabel: SPEC_CARD_KIND_LABELS[row.kind],
		input: row.input,
		segment:
			row.segmentId === null
				? null
				: { id: row.segmentId, position: row.segmentPosition!, title: row.segmentTitle! },
		atFrame: row.atFrame,
		atTimecode: row.atFrame === null ? null : clockOfEpisode(episode).format(row.atFrame),
		durationFrames,
		durationSeconds: framesToMilliseconds(durationFrames, rate) / 1000,
		neededSeconds: checked.ok ? readingSeconds(onScreenText(checked.card)) : null,
		pastCutEnd:
			row.atFrame !== null &&
			episode.cutDurationFrames !== null &&
			row.atFrame >= episode.cutDurationFrames,
		position: row.position,
		version: row.version,
		createdByName: row.createdByName,
		updatedAt: new Date(row.updatedAt).toISOString(),
		card: checked.ok ? checked.card : null,
		// A stored card always rendered when it was saved; this only shows if the spec modules tightened since.
		problem: checked.ok ? null : checked.message
	};
}

async function segmentsOf(
	executor: Executor,
	episodeId: string,
	programme: ProgrammeClock
): Promise<SpecCardSegment[]> {
	const rows = await executor
		.selectFrom('segment')
		.select(['id', 'position', 'title', 'recordedFrames'])
		.where('episodeId', '=', episodeId)
		.orderBy('position')
		.execute();
	let startsAt: number | null = 0;
	return rows.map((row) => {
		const segment: SpecCardSegment = {
			id: row.id,
			position: row.position,
			title: row.title,
			startsAtFrame: startsAt,
			startsAtTimecode: startsAt === null ? null : programme.format(startsAt)
		};
		startsAt =
			startsAt === null || row.recordedFrames === null ? null : startsAt + row.recordedFrames;
		return segment;
	});
}

function boardEpisode(episode: Episode, rate: FrameRate): SpecCardBoard['episode'] {
	const programme = clockOfEpisode(episode);
	return {
		id: episode.id,
		title: episode.title,
		slug: episode.slug,
		frameRate: rate,
		dropFrame: programme.dropFrame,
		timecodeStart: programme.startLabel,
		cutDurationFrames: episode.cutDurationFrames,
		// A length, so without the start offset.
		cutTimecode:
			episode.cutDurationFrames === null ? null : programme.formatLength(episode.cutDurationFrames)
	};
}

/** The episode's spec cards with their lines as they read on screen, and its segments; 404 for another channel's episode. */
export async function specCardsFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<SpecCardBoard> {
	const episode = await episodeInChannel(channelId, episodeId, executor);
	const rate = episode.frameRate;
	const [segments, rows] = await Promise.all([
		segmentsOf(executor, episode.id, clockOfEpisode(episode)),
		cardsQuery(executor, episode.id).execute()
	]);
	return {
		episode: boardEpisode(episode, rate),
		segments,
		cards: rows.map((row) => toView(row, episode, rate))
	};
}

async function cardView(
	executor: Executor,
	episode: Episode,
	cardId: string
): Promise<SpecCardView | null> {
	const row = await cardsQuery(executor, episode.id)
		.where('specCard.id', '=', cardId)
		.executeTakeFirst();
	return row ? toView(row, episode, episode.frameRate) : null;
}

/** Checks the card's shape and numbers; a parser's refusal is a 400 with its own words on the field. */
function checkedInput(input: SpecCardInput): SpecCardInput {
	const checked = checkSpecCard(input);
	if (!checked.ok)
		throw new DomainError(400, checked.message, { [`input.${checked.field}`]: [checked.message] });
	return checked.input;
}

async function checkSegment(
	executor: Executor,
	episodeId: string,
	segmentId: string | null
): Promise<string | null> {
	if (segmentId === null) return null;
	const segment = await executor
		.selectFrom('segment')
		.select('id')
		.where('id', '=', segmentId)
		.where('episodeId', '=', episodeId)
		.executeTakeFirst();
	if (!segment) {
		const message =
			'That segment is not in this episode’s rundown. Pick one from the list, or none.';
		throw new DomainError(400, message, { segmentId: [message] });
	}
	return segment.id;
}

/** The frame a placement names: typed text read at the episode's rate, or a frame count; undefined leaves it as it is. */
function placedFrame(
	input: { at?: string | null; atFrame?: number | null },
	episode: Episode
): number | null | undefined {
	let frame: number | null | undefined;
	if (input.atFrame !== undefined) frame = input.atFrame;
	else if (input.at !== undefined)
		frame =
			input.at === null
				? null
				: frameFromTyped('at', () => clockOfEpisode(episode).parse(input.at!));
	if (
		frame !== null &&
		frame !== undefined &&
		episode.cutDurationFrames !== null &&
		frame >= episode.cutDurationFrames
	) {
		const message = `That is at or after the end of the cut (${clockOfEpisode(episode).format(episode.cutDurationFrames)}). Place the card inside the cut, or change the cut’s length on the edit timeline first.`;
		throw new DomainError(400, message, { at: [message] });
	}
	return frame;
}

const durationFramesOf = (seconds: number | undefined, rate: FrameRate) =>
	seconds === undefined ? undefined : Math.max(1, secondsToFrames(seconds, rate));

/**
 * A card must stay on screen long enough to be read: about 17 characters a second ($lib/reading-time,
 * subtitle practice, a figure from memory). A shorter time is a 400 on the time field saying how many
 * seconds the card needs; a card that needs more than a card may stay up is told to split.
 */
function refuseUnreadable(card: SpecCard, durationFrames: number, rate: FrameRate): void {
	const text = onScreenText(card);
	const needed = readingSeconds(text);
	if (durationFrames >= secondsToFrames(needed, rate)) return;
	const characters = readableCharacters(text);
	const message =
		needed > ON_SCREEN_SECONDS_LIMITS.max
			? `This card puts ${characters} characters on screen: it needs ${needed} s to read at about ${READING_CHARACTERS_PER_SECOND} characters a second, longer than a card may stay up (${ON_SCREEN_SECONDS_LIMITS.max} s). Split it into two cards.`
			: `This card puts ${characters} characters on screen: it needs ${needed} s to read at about ${READING_CHARACTERS_PER_SECOND} characters a second. Show it for at least ${needed} s.`;
	throw new DomainError(400, message, { durationSeconds: [message] });
}

/** The card's lines as they read on screen (its input was checked by checkedInput). */
function renderedCard(input: SpecCardInput): SpecCard {
	const checked = checkSpecCard(input);
	if (!checked.ok) throw new DomainError(400, checked.message);
	return checked.card;
}

/** Adds a card to the episode, checked by the spec parsers, at the end of the episode's card order. */
export async function createSpecCard(
	channelId: string,
	actor: { id: string },
	episodeId: string,
	input: SpecCardCreate
): Promise<SpecCardView> {
	const cardInput = checkedInput(input.input);
	const card = renderedCard(cardInput);
	return db.transaction().execute(async (trx) => {
		// Locked so two cards added at once get different positions.
		const episode = await episodeOpenFor(trx, channelId, 'cards', { episodeId });
		const rate = episode.frameRate;
		const segmentId = await checkSegment(trx, episode.id, input.segmentId ?? null);
		const atFrame = placedFrame(input, episode) ?? null;
		// Without a time typed, the default, or the card's reading time when that is longer.
		const durationFrames =
			durationFramesOf(input.durationSeconds, rate) ??
			Math.max(
				defaultDurationFrames(rate),
				secondsToFrames(readingSeconds(onScreenText(card)), rate)
			);
		refuseUnreadable(card, durationFrames, rate);
		const last = await trx
			.selectFrom('specCard')
			.select((eb) => eb.fn.max('position').as('position'))
			.where('episodeId', '=', episode.id)
			.executeTakeFirst();
		const row = await trx
			.insertInto('specCard')
			.values({
				episodeId: episode.id,
				segmentId,
				kind: cardInput.kind,
				input: JSON.stringify(cardInput),
				atFrame,
				durationFrames,
				position: (last?.position ?? 0) + 1,
				createdBy: actor.id
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		return (await cardView(trx, episode, row.id))!;
	});
}

async function staleCard(executor: Executor, episode: Episode, cardId: string): Promise<never> {
	const current = await cardView(executor, episode, cardId);
	if (!current) throw cardNotFound();
	const what = current.card?.heading ?? current.kindLabel;
	throw new DomainError(
		409,
		`Someone changed the spec card “${what}” while you were working on it. Their version is shown now; make your change again on top of it.`,
		undefined,
		{ current }
	);
}

/** Changes a card's figures, segment, program time or time on screen; `version` must be the one read (else 409). */
export async function updateSpecCard(
	channelId: string,
	episodeId: string,
	cardId: string,
	input: SpecCardUpdate
): Promise<SpecCardView> {
	return db
		.transaction()
		.execute((trx) => updateSpecCardIn(trx, channelId, episodeId, cardId, input));
}

async function updateSpecCardIn(
	trx: Executor,
	channelId: string,
	episodeId: string,
	cardId: string,
	input: SpecCardUpdate
): Promise<SpecCardView> {
	const episode = await episodeOpenFor(trx, channelId, 'cards', { episodeId });
	if (!isUuid(cardId)) throw cardNotFound();
	const rate = episode.frameRate;
	const cardInput = input.input === undefined ? undefined : checkedInput(input.input);
	const segmentId =
		input.segmentId === undefined
			? undefined
			: await checkSegment(trx, episode.id, input.segmentId);
	const atFrame = placedFrame(input, episode);
	const durationFrames = durationFramesOf(input.durationSeconds, rate);
	// A change of figures or of time on screen is checked against the reading time of the card as
	// it will be; moving a card along the timeline is not (the board marks one left too short).
	if (cardInput !== undefined || durationFrames !== undefined) {
		const stored = await trx
			.selectFrom('specCard')
			.select(['input', 'durationFrames'])
			.where('id', '=', cardId)
			.where('episodeId', '=', episode.id)
			.executeTakeFirst();
		if (!stored) throw cardNotFound();
		refuseUnreadable(
			renderedCard(cardInput ?? stored.input),
			durationFrames ?? stored.durationFrames ?? defaultDurationFrames(rate),
			rate
		);
	}
	const row = await trx
		.updateTable('specCard')
		.set((eb) => ({
			...(cardInput !== undefined
				? { kind: cardInput.kind, input: JSON.stringify(cardInput) }
				: {}),
			...(segmentId !== undefined ? { segmentId } : {}),
			...(atFrame !== undefined ? { atFrame } : {}),
			...(durationFrames !== undefined ? { durationFrames } : {}),
			version: eb('version', '+', 1),
			updatedAt: new Date()
		}))
		.where('id', '=', cardId)
		.where('episodeId', '=', episode.id)
		.where('version', '=', input.version)
		.returning('id')
		.executeTakeFirst();
	if (!row) return staleCard(trx, episode, cardId);
	return (await cardView(trx, episode, row.id))!;
}

/** Places a card at a program time (typed text or a frame), or takes it off the cut with null: what the timeline calls. */
export async function placeSpecCard(
	channelId: string,
	episodeId: string,
	cardId: string,
	placement: { version: number } & ({ at: string | null } | { atFrame: number | null })
): Promise<SpecCardView> {
	return updateSpecCard(channelId, episodeId, cardId, placement);
}

/** Removes a card; with a version, only if nobody changed it since (else 409). */
export async function deleteSpecCard(
	channelId: string,
	episodeId: string,
	cardId: string,
	version?: number
): Promise<{ removed: SpecCardView }> {
	return db
		.transaction()
		.execute((trx) => deleteSpecCardIn(trx, channelId, episodeId, cardId, version));
}

async function deleteSpecCardIn(
	trx: Executor,
	channelId: string,
	episodeId: string,
	cardId: string,
	version?: number
): Promise<{ removed: SpecCardView }> {
	const episode = await episodeOpenFor(trx, channelId, 'cards', { episodeId });
	if (!isUuid(cardId)) throw cardNotFound();
	const removed = await cardView(trx, episode, cardId);
	if (!removed) throw cardNotFound();
	let removal = trx
		.deleteFrom('specCard')
		.where('id', '=', cardId)
		.where('episodeId', '=', episode.id);
	if (version !== undefined) removal = removal.where('version', '=', version);
	const row = await removal.returning('id').executeTakeFirst();
	if (!row) return staleCard(trx, episode, cardId);
	return { removed };
}

/** The board's cards as export rows; 422 when a stored card no longer renders, so no half-checked number reaches the graphics. */
function exportRowsOf(board: SpecCardBoard): SpecCardExportRow[] {
	const broken = board.cards.filter((view) => view.card === null);
	if (broken.length > 0) {
		throw new DomainError(
			422,
			`${broken.length === 1 ? 'One spec card needs' : `${broken.length} spec cards need`} checking before the export: ${broken.map((view) => view.problem).join(' ')} Open the card, fix it and save, then download again.`,
			undefined,
			{ problems: broken.map((view) => ({ cardId: view.id, message: view.problem })) }
		);
	}
	const cards = board.cards.map((view) => ({ ...view, card: view.card! }));
	return specCardExportRows(cards, clockOfHeading(board.episode));
}

export interface SpecCardDownload {
	body: string;
	contentType: string;
	filename: string;
}

/** A file name from the slug, kept to characters every download dialog and header accepts. */
function downloadName(slug: string, extension: string): string {
	const safe = slug.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'episode';
	return `${safe}-spec-cards.${extension}`;
}

/** The episode's spec cards as a CSV or JSON file for the editor's graphics. */
export async function specCardDownloadFor(
	channelId: string,
	episodeId: string,
	format: SpecCardExportFormat
): Promise<SpecCardDownload> {
	const board = await specCardsFor(channelId, episodeId);
	const rows = exportRowsOf(board);
	if (format === 'csv') {
		// RFC 4180 §3 registers the optional header parameter; ours always has a header row.
		return {
			body: specCardsCsv(rows),
			contentType: 'text/csv; charset=utf-8; header=present',
			filename: downloadName(board.episode.slug, 'csv')
		};
	}
	return {
		body: specCardsJson(board.episode, rows),
		contentType: 'application/json; charset=utf-8',
		filename: downloadName(board.episode.slug, 'json')
	};
}
