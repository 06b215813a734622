/** A host's speaking pace, from a timed reading aloud (migrations/2026-12-03-40-pace.ts). */
import type { ColumnType } from 'kysely';

export interface SpeakingPaceTable {
	channelId: string;
	personId: string;
	/** Spoken words of the paragraph read (countSpokenWords). */
	words: number;
	/** How long the reading took; words × 60000 ÷ milliseconds is the pace (80–260, checked). */
	milliseconds: number;
	recordedBy: string | null;
	recordedAt: ColumnType<Date, Date | string | undefined, Date | string>;
}

export interface SpeakingPaceTables {
	speakingPace: SpeakingPaceTable;
}
