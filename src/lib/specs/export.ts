/**
 * Spec card exports for the editor's graphics: the exact figures behind each card, one export row
 * per card, and the CSV and JSON files made from those rows.
 *
 * Every time is computed from the frame count at the episode's exact rate and written from whole
 * milliseconds (framesToMilliseconds), so no float formatting creeps into a titler's numbers.
 *
 * Pure module: no I/O, safe in the browser and on the server.
 */
import {
	clockOrUsual,
	framesToMilliseconds,
	type FrameRate,
	type ProgrammeClock
} from '../timecode';
import { csvText } from '../csv';
import type { SpecCard, SpecCardInput, SpecCardKind } from './cards';
import { liftSummary } from './lift';
import { compareTyres } from './tyre-change';
import { parseTyreSize } from './tyres';
import { torqueCard } from './units';

/** Exact figures behind a card's lines (unrounded), for graphics that lay the numbers out themselves. */
export function specCardFigures(input: SpecCardInput): Record<string, number | string> {
	switch (input.kind) {
		case 'tyre': {
			const size = parseTyreSize(input.size);
			return {
				diameterIn: size.diameterIn,
				diameterMm: size.diameterMm,
				sectionWidthIn: size.sectionWidthIn,
				sectionWidthMm: size.sectionWidthMm,
				sidewallIn: size.sidewallIn,
				sidewallMm: size.sidewallMm,
				revsPerMile: size.revsPerMile,
				revsPerKm: size.revsPerKm
			};
		}
		case 'tyre-change': {
			const change = compareTyres(parseTyreSize(input.from), parseTyreSize(input.to));
			return {
				fromDiameterIn: change.from.diameterIn,
				toDiameterIn: change.to.diameterIn,
				fromDiameterMm: change.from.diameterMm,
				toDiameterMm: change.to.diameterMm,
				diameterChangeIn: change.diameterChangeIn,
				diameterChangeMm: change.diameterChangeMm,
				axleHeightChangeIn: change.groundClearanceChangeIn,
				axleHeightChangeMm: change.groundClearanceChangeMm,
				speedometerFactor: change.speedometerFactor,
				revsPerMileChange: change.revsPerMileChange,
				revsPerKmChange: change.revsPerKmChange
			};
		}
		case 'torque': {
			const torque = torqueCard({ value: input.value, unit: input.unit });
			return {
				statedValue: input.value,
				statedUnit: input.unit,
				newtonMetres: torque.newtonMetres,
				footPoundsForce: torque.footPoundsForce,
				inchPoundsForce: torque.inchPoundsForce
			};
		}
		case 'lift': {
			const lift = liftSummary(input);
			return {
				frontLiftIn: lift.frontLiftIn,
				rearLiftIn: lift.rearLiftIn,
				frontLiftMm: lift.frontLiftMm,
				rearLiftMm: lift.rearLiftMm,
				rakeChangeIn: lift.rakeChangeIn,
				rakeChangeMm: lift.rakeChangeMm
			};
		}
		case 'text':
			return {};
	}
}

/** One card as the editor's graphics read it. */
export interface SpecCardExportRow {
	id: string;
	kind: SpecCardKind;
	segment: { position: number; title: string } | null;
	start: { frame: number; timecode: string; seconds: string } | null;
	end: { frame: number; timecode: string; seconds: string } | null;
	durationSeconds: string;
	heading: string;
	body: string | null;
	lines: SpecCard['lines'];
	cautions: string[];
	figures: Record<string, number | string>;
}

/** A card whose stored input renders, with its place in the cut: what an export row is made from. */
export interface ExportableSpecCard {
	id: string;
	kind: SpecCardKind;
	input: SpecCardInput;
	segment: { position: number; title: string } | null;
	atFrame: number | null;
	durationFrames: number;
	card: SpecCard;
}

/** Seconds with exactly three decimals, written from whole milliseconds so no float formatting creeps in. */
function secondsText(frames: number, rate: FrameRate): string {
	const milliseconds = framesToMilliseconds(frames, rate);
	return `${Math.floor(milliseconds / 1000)}.${String(milliseconds % 1000).padStart(3, '0')}`;
}

/** A point in the cut: its frame and seconds from the start of the cut, its label in the episode's programme timecode. */
function pointOf(frame: number, programme: ProgrammeClock) {
	return {
		frame,
		timecode: programme.format(frame),
		seconds: secondsText(frame, programme.rate)
	};
}

/**
 * The cards as export rows, in the order given; each ends its time on screen after it starts.
 * Timecodes are in the episode's programme timecode (a bare rate: its usual form from 00:00:00:00).
 */
export function specCardExportRows(
	cards: readonly ExportableSpecCard[],
	clockOrRate: ProgrammeClock | FrameRate
): SpecCardExportRow[] {
	const programme = clockOrUsual(clockOrRate);
	const rate = programme.rate;
	return cards.map((view) => {
		const card = view.card;
		return {
			id: view.id,
			kind: view.kind,
			segment: view.segment && { position: view.segment.position, title: view.segment.title },
			start: view.atFrame === null ? null : pointOf(view.atFrame, programme),
			end: view.atFrame === null ? null : pointOf(view.atFrame + view.durationFrames, programme),
			durationSeconds: secondsText(view.durationFrames, rate),
			heading: card.heading,
			body: card.body ?? null,
			lines: card.lines,
			cautions: card.cautions,
			figures: specCardFigures(view.input)
		};
	});
}

/**
 * CSV for a titler: one row per card, a header row, CRLF line ends (RFC 4180). Lines go in
 * numbered column triples (label, imperial, metric) up to the longest card; cautions share one
 * field, one caution per line, the way they read on screen.
 */
export function specCardsCsv(rows: SpecCardExportRow[]): string {
	const lineCount = Math.max(1, ...rows.map((row) => row.lines.length));
	const header = [
		'card_id',
		'kind',
		'segment_position',
		'segment_title',
		'start_timecode',
		'start_seconds',
		'end_timecode',
		'duration_seconds',
		'heading',
		'body'
	];
	for (let index = 1; index <= lineCount; index++)
		header.push(`line_${index}_label`, `line_${index}_imperial`, `line_${index}_metric`);
	header.push('cautions');
	const records = [header];
	for (const row of rows) {
		const record = [
			row.id,
			row.kind,
			row.segment ? String(row.segment.position) : '',
			row.segment?.title ?? '',
			row.start?.timecode ?? '',
			row.start?.seconds ?? '',
			row.end?.timecode ?? '',
			row.durationSeconds,
			row.heading,
			row.body ?? ''
		];
		for (let index = 0; index < lineCount; index++) {
			const line = row.lines[index];
			record.push(line?.label ?? '', line?.imperial ?? '', line?.metric ?? '');
		}
		record.push(row.cautions.join('\n'));
		records.push(record);
	}
	return csvText(records);
}

/** The JSON file: the episode's identity and rate, then the rows, two-space indented with a final newline. */
export function specCardsJson(
	episode: {
		id: string;
		slug: string;
		title: string;
		frameRate: FrameRate;
		dropFrame: boolean;
		/** The label of the cut's first frame; the rows' timecodes count from it. */
		timecodeStart?: string;
	},
	rows: SpecCardExportRow[]
): string {
	const document = {
		episode: {
			id: episode.id,
			slug: episode.slug,
			title: episode.title,
			frameRate: episode.frameRate,
			dropFrame: episode.dropFrame,
			timecodeStart: episode.timecodeStart ?? '00:00:00:00'
		},
		cards: rows
	};
	return `${JSON.stringify(document, null, 2)}\n`;
}
