/**
 * The cautions of a shoot day, one line per distinct caution with the segments it applies to, so a
 * call sheet reads "Use rated jack stands … (segments 2, 3, 5)" once instead of five times.
 */
import { hazardById } from '$lib/cautions';

export interface SegmentWithCautions {
	position: number;
	title: string;
	hazards: string[];
	cautions: { hazard: string; text: string }[];
}

export interface DayCaution {
	text: string;
	segments: { position: number; title: string }[];
}

export function dayCautions(segments: SegmentWithCautions[]): DayCaution[] {
	const byText = new Map<string, DayCaution>();
	for (const segment of segments) {
		// A flagged segment without its own caution lines still carries the default wording.
		const lines = segment.cautions.length
			? segment.cautions
			: segment.hazards.map((h) => ({ hazard: h, text: hazardById(h)?.defaultCaution ?? h }));
		for (const line of lines) {
			const entry = byText.get(line.text) ?? { text: line.text, segments: [] };
			if (!entry.segments.some((s) => s.position === segment.position))
				entry.segments.push({ position: segment.position, title: segment.title });
			byText.set(line.text, entry);
		}
	}
	return [...byText.values()].sort((a, b) => a.segments[0].position - b.segments[0].position);
}
