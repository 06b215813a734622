/**
 * Demo cut lengths and chapters: the episode in the edit stage has a cut and a first, valid set of
 * chapters; the published one has its full set, two of them linking the featured part. Titles are
 * our own fictional scenario.
 */
import type { Transaction } from 'kysely';
import type { Database } from '../../src/lib/server/db/types.ts';
import { parseTimecode, type FrameRate } from '../../src/lib/timecode.ts';
import { chapterStartFromText } from '../../src/lib/chapters/start.ts';
import type { SeedContext } from './seed-context.ts';

interface DemoChapter {
	/** A clock time (M:SS) as the editor would type it; read as the edit page reads it. */
	at: string;
	title: string;
	/** SKU of a featured part whose shop page the chapter links to. */
	partSku?: string;
}

interface DemoEdit {
	/** The cut's length as timecode at the episode's rate. */
	cut: string;
	chapters: DemoChapter[];
}

const demoEdits: Record<string, DemoEdit> = {
	'mule-rear-block-lift': {
		cut: '00:13:40;00',
		chapters: [
			{ at: '0:00', title: 'Cold open: why Mule sits nose-high' },
			{ at: '0:52', title: 'Safety first: wheel chocks, and jack stands under the frame' },
			{ at: '2:10', title: 'Supporting the axle and loosening the U-bolts' },
			{ at: '4:05', title: 'Tapered block in, pinion angle checked', partSku: 'KBS-LB-300T' },
			{ at: '6:40', title: 'New U-bolts, torqued in a cross pattern', partSku: 'KBS-UB-58-11' },
			{ at: '9:05', title: 'Matched rear shocks' },
			{ at: '11:30', title: 'Road test, then re-torque after 50 miles' },
			{ at: '12:50', title: 'What it cost, and what comes next' }
		]
	},
	'tallboy-coil-spacers': {
		cut: '00:12:18;00',
		chapters: [
			{ at: '0:00', title: 'Cold open: an inch and a half, and no extra travel' },
			{ at: '0:41', title: 'What coil spacers do, and what they don’t' },
			{ at: '1:55', title: 'Safety: supporting a coil-sprung axle' },
			{
				at: '3:02',
				title: 'Front: dropping the axle and fitting the spacers',
				partSku: 'KBS-CS-150'
			},
			{ at: '5:20', title: 'Front: sway bar links and brake line slack' },
			{ at: '6:48', title: 'Rear: spacers in, shock length checked', partSku: 'KBS-CS-150' },
			{ at: '8:35', title: 'Alignment check and headlight aim' },
			{ at: '9:50', title: 'Trail test at the quarry' },
			{ at: '11:20', title: 'Verdict, costs and the parts list' }
		]
	}
};

export async function seedEdit(trx: Transaction<Database>, context: SeedContext): Promise<void> {
	for (const [slug, edit] of Object.entries(demoEdits)) {
		const episode = context.episodes.get(slug);
		if (!episode) continue;
		const rate: FrameRate = episode.frameRate;
		await trx
			.updateTable('episode')
			.set({ cutDurationFrames: parseTimecode(edit.cut, rate) })
			.where('id', '=', episode.id)
			.execute();
		for (const chapter of edit.chapters) {
			const part = chapter.partSku
				? await trx
						.selectFrom('part')
						.select(['id', 'storeUrl'])
						.where('channelId', '=', episode.channelId)
						.where('sku', '=', chapter.partSku)
						.executeTakeFirst()
				: undefined;
			await trx
				.insertInto('chapter')
				.values({
					episodeId: episode.id,
					startFrame: chapterStartFromText(chapter.at, rate),
					title: chapter.title,
					url: part?.storeUrl ?? null,
					partId: part?.id ?? null
				})
				.execute();
		}
	}
}
