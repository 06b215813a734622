/**
 * Demo spec cards: on the block-lift episode (in the edit, with a cut) a lift card and a torque
 * card placed where the host talks about them; on the tyre episode (still a script, no cut yet) a
 * tyre-change card attached to its numbers segment, waiting to be placed. Every card goes through
 * the same check the app uses, so a demo card can never carry a number the parsers would refuse.
 */
import type { Transaction } from 'kysely';
import type { Database } from '../../src/lib/server/db/types.ts';
import type { SpecCardInput } from '../../src/lib/specs/index.ts';
import { checkSpecCard, DEFAULT_ON_SCREEN_SECONDS } from '../../src/lib/schemas/spec-cards.ts';
import { parseTimecode, secondsToFrames } from '../../src/lib/timecode.ts';
import { onScreenText, readingSeconds } from '../../src/lib/reading-time.ts';
import type { SeedContext } from './seed-context.ts';

interface DemoCard {
	/** Title of the rundown segment the card belongs to. */
	segment: string;
	/** Program time as the editor would type it (timecode at the episode's rate), or null while the episode has no cut. */
	at: string | null;
	input: SpecCardInput;
}

const demoCards: Record<string, DemoCard[]> = {
	'mule-rear-block-lift': [
		{
			segment: 'Tapered block in, pinion angle checked',
			at: '00:04:48;00',
			// Project Mule: independent front on coil-over struts (2 in strut spacers), leaf-sprung rear axle (3 in block).
			input: {
				kind: 'lift',
				frontLiftIn: 2,
				rearLiftIn: 3,
				frontSuspension: 'strut',
				rearSuspension: 'leaf',
				method: { front: 'strut-spacer', rear: 'lift-block' }
			}
		},
		{
			segment: 'New U-bolts, torqued in a cross pattern',
			at: '00:07:31;00',
			// The demo figure is invented for this fictional kit: the card itself tells viewers to verify
			// against the manufacturer's instructions, which is the only figure anyone should use.
			input: { kind: 'torque', value: 85, unit: 'ft·lbf', fastener: 'U-bolt nuts, 5/8 in' }
		}
	],
	'mule-285-tyres': [
		{
			segment: 'The numbers: diameter and clearance',
			at: null,
			input: { kind: 'tyre-change', from: '265/70R17', to: '285/70R17' }
		}
	]
};

export async function seedSpecCards(
	trx: Transaction<Database>,
	context: SeedContext
): Promise<void> {
	const editor = context.people.get('jules@cutbench.test') ?? null;
	for (const [slug, cards] of Object.entries(demoCards)) {
		const episode = context.episodes.get(slug);
		if (!episode) continue;
		const rate = episode.frameRate;
		let position = 0;
		for (const card of cards) {
			const checked = checkSpecCard(card.input);
			if (!checked.ok)
				throw new Error(`demo spec card on ${slug} does not check: ${checked.message}`);
			const segment = await trx
				.selectFrom('segment')
				.select('id')
				.where('episodeId', '=', episode.id)
				.where('title', '=', card.segment)
				.executeTakeFirst();
			if (!segment)
				throw new Error(
					`demo spec card on ${slug} names a segment that is not in the rundown: ${card.segment}`
				);
			await trx
				.insertInto('specCard')
				.values({
					episodeId: episode.id,
					segmentId: segment.id,
					kind: checked.input.kind,
					input: JSON.stringify(checked.input),
					atFrame: card.at === null ? null : parseTimecode(card.at, rate),
					// Long enough to read: the default, or the card's reading time when longer.
					durationFrames: secondsToFrames(
						Math.max(DEFAULT_ON_SCREEN_SECONDS, readingSeconds(onScreenText(checked.card))),
						rate
					),
					position: ++position,
					createdBy: editor
				})
				.execute();
		}
	}
}
