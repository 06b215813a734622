/**
 * The publish kit: the episode description assembled from what the crew already entered, in
 * blocks the merch team copies one by one or as a whole:
 *   logline · chapters (the chapter module's `txt` format) · parts in this episode (the channel's
 *   disclosure first, then each part with its times and tracked link) · safety (the episode's caution cards and the general safety note)
 *   · the channel's call to action and contact.
 * Chapters that are missing or break the chapter rules don't stop the kit: the block says so.
 *
 * The disclosure (Channel settings) opens the parts block, above the links, so a viewer reads that
 * the channel earns on them before clicking one, and copying the block alone carries it too
 * (placing it before the links is common practice). With links and no disclosure the block says so,
 * and the publish gate refuses ($lib/gates).
 *
 * Everything is read in ONE query (JSON aggregates of chapters, cautions and featured parts beside
 * the episode and channel row). Only when a featured part has no tracked link yet (a link made
 * outside the notes page) is a second round made: the missing links, then the query again.
 *
 * The description is counted as video platforms count it, in UTF-8 bytes, against the channel's
 * limit held to the platforms' 5,000 (from memory); `<` and `>`, which platforms refuse, are
 * flagged with their line and column, and the episode title is checked against 100 characters
 * ($lib/publish-limits).
 */
import { sql } from 'kysely';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import { db } from '../db';
import { episodeNotFound, type Executor } from '../episodes/episodes';
import { isUuid } from '../auth/identity';
import { featuredLinks, groupFeatured, type FeaturedPart } from './featured-parts';
import { ensureTrackedLinks, linkAddress } from './tracked-links';
import { ChapterExportError, exportChapters, validateChapters } from '$lib/chapters';
import { GENERAL_SAFETY_NOTE, LIFT_LAW_NOTE } from '$lib/cautions';
import type { KitFormat } from '$lib/schemas/parts';
import {
	DESCRIPTION_MAX,
	TITLE_MAX,
	descriptionLength,
	descriptionProblems,
	forbiddenMarks,
	titleLength,
	titleProblems,
	type ForbiddenMark
} from '$lib/publish-limits';

export type KitBlockId = 'logline' | 'chapters' | 'parts' | 'safety' | 'call-to-action';

export interface KitBlock {
	id: KitBlockId;
	title: string;
	/** Plain text, as pasted into a video description; '' when the block has nothing to say. */
	text: string;
	markdown: string;
	/** What is missing or wrong, in the crew's words. */
	problems: string[];
	/** Why this block cannot be left out of the description (absent: it can). */
	required?: string;
	/** The parts block: the channel's disclosure, placed first in the block ('' when none is set). */
	disclosure?: string;
}

export interface PublishKit {
	episode: { id: string; title: string; slug: string; stage: string };
	blocks: KitBlock[];
	/** The whole description: every block with text, a blank line between. */
	text: string;
	markdown: string;
	/** Unicode code points, as a person counts characters. */
	characters: number;
	/** What platforms count against the limit: UTF-8 bytes. */
	length: number;
	/** The channel's limit, never above the platforms' 5,000. */
	limit: number;
	overLimit: boolean;
	/** Every `<` and `>` in the description, which platforms refuse. */
	forbidden: ForbiddenMark[];
	/** Why a platform would refuse the description as assembled, in the merch team's words. */
	problems: string[];
	title: { text: string; length: number; limit: number; problems: string[] };
}

/** Unicode code points, so a “°” or an emoji counts as one character. */
export const characterCount = (text: string) => [...text].length;

/** The one query: episode, channel settings, chapters, cautions and featured parts. */
function kitQuery(executor: Executor, channelId: string, episodeId: string) {
	return executor
		.selectFrom('episode')
		.innerJoin('channel', 'channel.id', 'episode.channelId')
		.select((eb) => [
			'episode.id',
			'episode.title',
			'episode.slug',
			'episode.logline',
			'episode.stage',
			'episode.frameRate',
			'episode.cutDurationFrames',
			'channel.callToAction',
			'channel.contact',
			'channel.disclosure',
			'channel.descriptionLimit',
			jsonArrayFrom(
				eb
					.selectFrom('chapter')
					.select(['chapter.startFrame', 'chapter.title', 'chapter.url'])
					.whereRef('chapter.episodeId', '=', 'episode.id')
					.orderBy('chapter.startFrame')
					.orderBy('chapter.createdAt')
					.orderBy('chapter.id')
			).as('chapters'),
			jsonArrayFrom(
				eb
					.selectFrom('caution')
					.innerJoin('segment', 'segment.id', 'caution.segmentId')
					.select(['caution.text', 'caution.atFrame', 'segment.position'])
					.whereRef('segment.episodeId', '=', 'episode.id')
					.orderBy(sql`caution.at_frame ASC NULLS LAST`)
					.orderBy('segment.position')
					.orderBy('caution.hazard')
			).as('cautions'),
			jsonArrayFrom(featuredLinks(executor, eb.ref('episode.id'))).as('featured'),
			// Lift and tyre episodes carry the road-legality note too.
			sql<boolean>`(EXISTS (SELECT 1 FROM episode_build JOIN build ON build.id = episode_build.build_id WHERE episode_build.episode_id = episode.id AND (build.front_lift_in > 0 OR build.rear_lift_in > 0))
				OR EXISTS (SELECT 1 FROM segment WHERE segment.episode_id = episode.id AND segment.kind = 'wheels-tyres'))`.as(
				'liftEpisode'
			)
		])
		.where('episode.id', '=', episodeId)
		.where('episode.channelId', '=', channelId)
		.executeTakeFirst();
}

type KitRow = NonNullable<Awaited<ReturnType<typeof kitQuery>>>;

/** CommonMark backslash escapes for the punctuation that would otherwise format text. */
const escapeMarkdown = (text: string) => text.replace(/[\\`*_[\]<>#|]/g, '\\$&');

function loglineBlock(row: KitRow): KitBlock {
	const text = row.logline.trim();
	return {
		id: 'logline',
		title: 'Logline',
		text,
		markdown: escapeMarkdown(text),
		problems: text ? [] : ['The episode has no logline yet: write one on the episode page.']
	};
}

function chaptersBlock(row: KitRow): KitBlock {
	const title = 'Chapters';
	const rate = row.frameRate;
	const chapters = row.chapters.map((chapter) => ({
		startFrame: chapter.startFrame,
		title: chapter.title,
		url: chapter.url
	}));
	let problems: string[];
	if (chapters.length === 0)
		problems = ['There are no chapters yet: the editor marks them on the edit timeline.'];
	else
		problems = validateChapters(chapters, row.cutDurationFrames ?? 0, rate).map(
			(problem) => problem.message
		);
	let lines: string[] = [];
	if (problems.length === 0) {
		try {
			lines = exportChapters('txt', chapters, { rate, cutEndFrame: row.cutDurationFrames ?? 0 })
				.body.trimEnd()
				.split('\n');
		} catch (failure) {
			if (!(failure instanceof ChapterExportError)) throw failure;
			problems = [failure.message];
		}
	}
	if (problems.length > 0) {
		const notice = `[Chapters not ready: ${problems.join(' ')} Fix them on the edit timeline.]`;
		return {
			id: 'chapters',
			title,
			text: `${title}\n${notice}`,
			markdown: `## ${title}\n\n${escapeMarkdown(notice)}`,
			problems
		};
	}
	return {
		id: 'chapters',
		title,
		text: [title, ...lines].join('\n'),
		// Each timestamp on its own line: a list, so Markdown doesn't run them together.
		markdown: [`## ${title}`, '', ...lines.map((line) => `- ${escapeMarkdown(line)}`)].join('\n'),
		problems: []
	};
}

const statusNote = (part: FeaturedPart) =>
	part.status === 'discontinued'
		? ' [discontinued]'
		: part.status === 'out_of_stock'
			? ' [out of stock]'
			: '';

/** What the parts block says when the channel has no disclosure (the gate's reason says the same). */
export const DISCLOSURE_MISSING =
	'These are tracked links and the channel has no disclosure to put above them: the producer writes one under Channel settings. An episode with tracked links is not published without it.';

function partsBlock(parts: readonly FeaturedPart[], origin: string, disclosure: string): KitBlock {
	const title = 'Parts in this episode';
	if (parts.length === 0)
		return {
			id: 'parts',
			title,
			text: '',
			markdown: '',
			problems: [
				'No parts are linked on the segment notes yet: the merch team links them on the notes page.'
			]
		};
	const problems: string[] = disclosure ? [] : [DISCLOSURE_MISSING];
	// Before the links, so it is read before a click (common practice).
	const text: string[] = disclosure ? [title, disclosure] : [title];
	const markdown: string[] = disclosure
		? [`## ${title}`, '', escapeMarkdown(disclosure), '']
		: [`## ${title}`, ''];
	for (const part of parts) {
		// Two notes in the same second read as one time in a description.
		const clocks = [...new Set(part.appearances.map((appearance) => appearance.clock))];
		const times = clocks.length ? `, at ${clocks.join(', ')}` : '';
		const address = linkAddress(origin, part.linkCode!);
		text.push(`- ${part.name} (${part.brand}, ${part.sku})${times}${statusNote(part)}: ${address}`);
		markdown.push(
			`- [${escapeMarkdown(part.name)}](${address}) (${escapeMarkdown(part.brand)}, ${escapeMarkdown(part.sku)})${times}${escapeMarkdown(statusNote(part))}`
		);
		if (part.status !== 'active')
			problems.push(
				`${part.sku} is ${part.status === 'discontinued' ? 'discontinued' : 'out of stock'}: link an active part instead.`
			);
		if (part.unplaced.length > 0)
			problems.push(`${part.sku} is on a note with no program time: the editor places it.`);
	}
	return {
		id: 'parts',
		title,
		text: text.join('\n'),
		markdown: markdown.join('\n'),
		problems,
		disclosure
	};
}

function safetyBlock(row: KitRow): KitBlock {
	const title = 'Safety';
	// A caution shown twice in the cut (the same words) is listed once.
	const cautions = [...new Set(row.cautions.map((caution) => caution.text.trim()).filter(Boolean))];
	const notes = row.liftEpisode ? [GENERAL_SAFETY_NOTE, LIFT_LAW_NOTE] : [GENERAL_SAFETY_NOTE];
	return {
		id: 'safety',
		title,
		text: [title, ...cautions.map((caution) => `- ${caution}`), ...notes].join('\n'),
		markdown: [
			`## ${title}`,
			'',
			...cautions.map((caution) => `- ${escapeMarkdown(caution)}`),
			...(cautions.length ? [''] : []),
			notes.map(escapeMarkdown).join('\n\n')
		].join('\n'),
		problems: [],
		required:
			'Always in the description: viewers copy this work, so the cautions and the note that defers to manufacturer instructions, local codes and licensed professionals go with it.'
	};
}

function callToActionBlock(row: KitRow): KitBlock {
	const lines = [row.callToAction.trim(), row.contact.trim()].filter(Boolean);
	return {
		id: 'call-to-action',
		title: 'Call to action and contact',
		text: lines.join('\n'),
		markdown: lines.map(escapeMarkdown).join('\n\n'),
		problems: lines.length
			? []
			: ['The channel has no call to action or contact yet: the producer sets them under Channel.']
	};
}

function assemble(row: KitRow, origin: string): PublishKit {
	const parts = groupFeatured(row.featured as Parameters<typeof groupFeatured>[0], row.frameRate);
	const blocks = [
		loglineBlock(row),
		chaptersBlock(row),
		partsBlock(parts, origin, row.disclosure.trim()),
		safetyBlock(row),
		callToActionBlock(row)
	];
	const text = blocks
		.map((block) => block.text)
		.filter(Boolean)
		.join('\n\n');
	const markdown = `# ${escapeMarkdown(row.title)}\n\n${blocks
		.map((block) => block.markdown)
		.filter(Boolean)
		.join('\n\n')}\n`;
	const length = descriptionLength(text);
	const limit = Math.min(row.descriptionLimit, DESCRIPTION_MAX);
	return {
		episode: { id: row.id, title: row.title, slug: row.slug, stage: row.stage },
		blocks,
		text,
		markdown,
		characters: characterCount(text),
		length,
		limit,
		overLimit: length > limit,
		forbidden: forbiddenMarks(text),
		problems: descriptionProblems(text, limit),
		title: {
			text: row.title,
			length: titleLength(row.title),
			limit: TITLE_MAX,
			problems: titleProblems(row.title)
		}
	};
}

/** The publish kit of one episode of the channel; 404 otherwise. `origin` makes the /go/ links absolute. */
export async function publishKitFor(
	channelId: string,
	episodeId: string,
	options: { origin: string },
	executor: Executor = db
): Promise<PublishKit> {
	if (!isUuid(episodeId)) throw episodeNotFound();
	let row = await kitQuery(executor, channelId, episodeId);
	if (!row) throw episodeNotFound();
	const unlinked = row.featured
		.filter((feature) => feature.linkCode === null)
		.map((feature) => feature.partId);
	if (unlinked.length > 0) {
		await ensureTrackedLinks(channelId, row.id, unlinked, executor);
		row = (await kitQuery(executor, channelId, episodeId))!;
	}
	return assemble(row, options.origin);
}

/** The kit as a file: Markdown, plain text, or JSON (the whole kit object). */
export function renderKit(
	kit: PublishKit,
	format: KitFormat
): { body: string; contentType: string; extension: string } {
	if (format === 'md')
		return { body: kit.markdown, contentType: 'text/markdown; charset=utf-8', extension: 'md' };
	if (format === 'txt')
		return { body: `${kit.text}\n`, contentType: 'text/plain; charset=utf-8', extension: 'txt' };
	return {
		body: `${JSON.stringify(kit, null, 2)}\n`,
		contentType: 'application/json; charset=utf-8',
		extension: 'json'
	};
}
