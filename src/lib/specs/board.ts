/**
 * The spec-cards board as the pages read it: the episode's cards with their lines as they read on
 * screen, and the segments a card can be attached to. Types only, shared by server and browser.
 */
import type { FrameRate } from '../timecode';
import type { SpecCard, SpecCardInput, SpecCardKind } from './cards';

export interface SpecCardSegment {
	id: string;
	position: number;
	title: string;
	/** Where the segment starts in the cut, from the rundown's recorded lengths; null while one before it is unknown. */
	startsAtFrame: number | null;
	startsAtTimecode: string | null;
}

export interface SpecCardView {
	id: string;
	kind: SpecCardKind;
	kindLabel: string;
	/** The card as entered. */
	input: SpecCardInput;
	segment: { id: string; position: number; title: string } | null;
	/** Program time in the cut (episode frame rate); null until placed. */
	atFrame: number | null;
	atTimecode: string | null;
	durationFrames: number;
	durationSeconds: number;
	/** Whole seconds the card's words need to be read ($lib/reading-time); null if it no longer renders. */
	neededSeconds: number | null;
	/** True when the cut's length is known and the card starts at or after its end. */
	pastCutEnd: boolean;
	position: number;
	version: number;
	createdByName: string | null;
	updatedAt: string;
	/** The lines as they read on screen; null (with `problem`) if the stored input no longer renders. */
	card: SpecCard | null;
	problem: string | null;
}

export interface SpecCardBoard {
	episode: {
		id: string;
		title: string;
		slug: string;
		frameRate: FrameRate;
		dropFrame: boolean;
		/** The label of the cut's first frame in the programme timecode, e.g. 01:00:00:00. */
		timecodeStart: string;
		cutDurationFrames: number | null;
		cutTimecode: string | null;
	};
	segments: SpecCardSegment[];
	/** Placed cards in program-time order, then unplaced ones in the order they were made. */
	cards: SpecCardView[];
}
