/**
 * Demo data for the parts work: segment notes with their program times, takes and featured parts
 * for the episode in the edit (one note still waiting for the editor to place it) and the
 * published one, a tracked link per featured part, and a fortnight of click history for the
 * published episode's links. Everything here is our own fictional scenario.
 */
import { randomBytes } from 'node:crypto';
import type { Transaction } from 'kysely';
import type { Database } from '../../src/lib/server/db/types.ts';
import { chapterStartFromText } from '../../src/lib/chapters/start.ts';
import { parseTimecode, type FrameRate } from '../../src/lib/timecode.ts';
import type { SeedContext } from './seed-context.ts';

interface NoteSeed {
	/** One-based rundown position. */
	segment: number;
	take?: string;
	/** Camera timecode inside the take, as logged (non-drop). */
	source?: string;
	/** Clock time in the cut as the editor typed it; absent = not placed yet. */
	at?: string;
	text: string;
	parts: string[];
}

const camera = 'mika@torquehaven.test';

const demoNotes: Record<string, NoteSeed[]> = {
	'mule-rear-block-lift': [
		{
			segment: 1,
			take: 'ACAM_1001',
			source: '09:02:15:00',
			at: '0:08',
			text: 'Camper hitched, tail down. The kit is laid out on the bench behind Rico.',
			parts: ['KBS-LB-300T', 'KBS-UB-58-11', 'QS-MT-230R']
		},
		{
			segment: 2,
			take: 'ACAM_2004',
			source: '09:22:20:00',
			at: '1:02',
			text: 'Stands under the frame rails, then the shove test.',
			parts: ['KBS-BS-6T']
		},
		{
			segment: 4,
			take: 'ACAM_4002',
			source: '10:40:20:00',
			at: '4:12',
			text: 'Tapered block onto the perch, thick end to the rear. Label readable on the block.',
			parts: ['KBS-LB-300T']
		},
		{
			segment: 5,
			take: 'ACAM_5003',
			source: '11:10:30:00',
			at: '6:48',
			text: 'New U-bolts snugged by hand, torque wrench in shot for the cross pattern.',
			parts: ['KBS-UB-58-11', 'KBS-TW-250']
		},
		{
			segment: 6,
			take: 'ACAM_6001',
			source: '11:41:00:00',
			at: '9:12',
			text: 'Shock swap, driver side first. Box label faces the camera.',
			parts: ['QS-MT-230R']
		},
		// Logged on set; the editor hasn't placed it yet, so the featured parts list warns.
		{
			segment: 6,
			take: 'BCAM_6002',
			source: '11:50:10:00',
			text: 'Brake hose at full droop; Rico holds up the extended hose for the close-up.',
			parts: ['NB-BL-REAR']
		},
		{
			segment: 7,
			take: 'BCAM_7001',
			source: '14:00:30:00',
			at: '11:35',
			text: 'Chase-car tracking shot, camper back on. No parts in frame.',
			parts: []
		}
	],
	'tallboy-coil-spacers': [
		{
			segment: 2,
			take: 'BCAM_101002',
			source: '08:30:12:00',
			at: '0:52',
			text: 'Spacer in hand next to the spring, part number on the box.',
			parts: ['KBS-CS-150']
		},
		{
			segment: 3,
			take: 'ACAM_102001',
			source: '09:00:20:00',
			at: '2:05',
			text: 'Stands under the frame before the axle drops.',
			parts: ['KBS-BS-6T']
		},
		{
			segment: 4,
			take: 'ACAM_103002',
			source: '09:31:00:00',
			at: '3:10',
			text: 'Spacer seated on the front spring perch.',
			parts: ['KBS-CS-150']
		},
		{
			segment: 5,
			take: 'BCAM_104001',
			source: '10:00:10:00',
			at: '5:31',
			text: 'Brake line slack at full droop; the extended lines go on.',
			parts: ['NB-BL-EXT2']
		},
		{
			segment: 6,
			take: 'BCAM_105003',
			source: '10:40:30:00',
			at: '7:02',
			text: 'Rear spacer in, shock length checked at droop.',
			parts: ['KBS-CS-150', 'QS-TT-250']
		},
		{
			segment: 7,
			take: 'ACAM_106001',
			source: '13:00:40:00',
			at: '10:05',
			text: 'Quarry ledge climb; the tyre sidewall fills the frame.',
			parts: ['CT-MT-33125015']
		}
	]
};

/** Clicks per day for the published episode's links, days since it went live (0 = launch day). */
const clickShape = (day: number, rank: number) =>
	Math.max(0, Math.round((38 - rank * 7) * Math.exp(-day / 5) + ((day * 7 + rank * 3) % 5)));

// The same alphabet as src/lib/server/merch/tracked-links.ts (which the seed can't import: it reads $env).
const CODE_ALPHABET = 'ABCDEFGHJKLMNPQRSTUVWXYZabcdefghijkmnopqrstuvwxyz23456789';
function linkCode(): string {
	let code = '';
	while (code.length < 8) {
		for (const byte of randomBytes(16)) {
			if (byte < 228 && code.length < 8) code += CODE_ALPHABET[byte % CODE_ALPHABET.length];
		}
	}
	return code;
}

export async function seedParts(trx: Transaction<Database>, context: SeedContext): Promise<void> {
	const authorId = context.people.get(camera) ?? null;
	for (const [slug, notes] of Object.entries(demoNotes)) {
		const episode = context.episodes.get(slug);
		if (!episode) continue;
		const rate: FrameRate = episode.frameRate;
		const segments = await trx
			.selectFrom('segment')
			.select(['id', 'position'])
			.where('episodeId', '=', episode.id)
			.execute();
		const takes = await trx
			.selectFrom('take')
			.innerJoin('shot', 'shot.id', 'take.shotId')
			.innerJoin('segment', 'segment.id', 'shot.segmentId')
			.select(['take.id', 'take.clipName'])
			.where('segment.episodeId', '=', episode.id)
			.execute();
		const parts = await trx
			.selectFrom('part')
			.select(['id', 'sku'])
			.where('channelId', '=', episode.channelId)
			.execute();
		const partId = (sku: string) => {
			const found = parts.find((part) => part.sku === sku);
			if (!found) throw new Error(`demo note names ${sku}, which is not in the demo catalogue`);
			return found.id;
		};
		const featured = new Set<string>();
		for (const [index, note] of notes.entries()) {
			const segmentId = segments.find((segment) => segment.position === note.segment)?.id ?? null;
			const takeId = note.take
				? (takes.find((take) => take.clipName === note.take)?.id ?? null)
				: null;
			const row = await trx
				.insertInto('segmentNote')
				.values({
					episodeId: episode.id,
					segmentId,
					takeId,
					sourceFrame: takeId && note.source ? parseTimecode(note.source, rate) : null,
					programFrame: note.at ? chapterStartFromText(note.at, rate) : null,
					text: note.text,
					authorId,
					// Notes were logged one after another on set; keep that order for equal times.
					createdAt: new Date(Date.now() - (notes.length - index) * 60_000)
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			for (const sku of note.parts) {
				await trx
					.insertInto('segmentNotePart')
					.values({ noteId: row.id, partId: partId(sku) })
					.execute();
				featured.add(sku);
			}
		}
		const links: { id: string; sku: string }[] = [];
		for (const sku of featured) {
			const link = await trx
				.insertInto('trackedLink')
				.values({ code: linkCode(), episodeId: episode.id, partId: partId(sku) })
				.returning('id')
				.executeTakeFirstOrThrow();
			links.push({ id: link.id, sku });
		}
		if (episode.stage !== 'published') continue;
		const today = Date.UTC(
			new Date().getUTCFullYear(),
			new Date().getUTCMonth(),
			new Date().getUTCDate()
		);
		const liveForDays = 14;
		const rows = links.flatMap((link, rank) =>
			Array.from({ length: liveForDays + 1 }, (_, day) => ({
				linkId: link.id,
				day: new Date(today - (liveForDays - day) * 86_400_000).toISOString().slice(0, 10),
				clicks: clickShape(day, rank)
			})).filter((row) => row.clicks > 0)
		);
		if (rows.length) await trx.insertInto('linkClickDay').values(rows).execute();
	}
}
