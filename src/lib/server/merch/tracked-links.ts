/**
 * Tracked links: one short link /go/[code] per part per episode. Following it redirects (302) to
 * the part's shop page with campaign parameters, and adds one to that link's count for the day.
 *
 * Campaign parameters (the utm_* names are common practice of web analytics tools, from memory):
 * - utm_source   = the channel's name as a slug ("torquehaven-garage"): the visitor came from our channel.
 * - utm_medium   = "video": the link sits in a video's description; analytics tools commonly group
 *                  a medium containing "video" as video traffic (from memory).
 * - utm_campaign = the episode's slug, so one episode's links group together.
 * - utm_content  = the part number (SKU), so each part's clicks are told apart.
 *
 * Privacy: a click stores a count per link and day (UTC) and nothing else: no address, no browser,
 * no cookie. HEAD requests (link checkers, bots previewing a link) are answered but not counted.
 */
import { randomBytes } from 'node:crypto';
import { sql } from 'kysely';
import { db } from '../db';
import { notFound } from '../http/api';
import type { Executor } from '../episodes/episodes';

export const UTM_MEDIUM = 'video';
/** How many days the clicks chart shows by default. */
export const CLICK_DAYS = 30;

const CODE_ALPHABET = 'ABCDEFGHJKLMNPQRSTUVWXYZabcdefghijkmnopqrstuvwxyz23456789';
export const CODE_LENGTH = 8;
const CODE_PATTERN = /^[A-Za-z0-9]{6,16}$/;

/** Lower-case words joined by hyphens: "Torquehaven Garage" → "torquehaven-garage". */
export function campaignSlug(text: string): string {
	return text
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-+|-+$/g, '')
		.slice(0, 80);
}

export interface CampaignTags {
	/** utm_source: the channel, as a slug. */
	source: string;
	/** utm_campaign: the episode's slug. */
	campaign: string;
	/** utm_content: the part number. */
	content: string;
	/** utm_medium; "video" unless told otherwise. */
	medium?: string;
}

/**
 * The store URL with utm_source, utm_medium, utm_campaign and utm_content set, built with the
 * WHATWG URL API. The store's own query string is kept as written (only earlier utm_* values of
 * the same names are replaced) and its fragment stays at the end.
 */
export function trackedUrl(storeUrl: string, tags: CampaignTags): string {
	const url = new URL(storeUrl);
	const ours = new URLSearchParams({
		utm_source: tags.source,
		utm_medium: tags.medium ?? UTM_MEDIUM,
		utm_campaign: tags.campaign,
		utm_content: tags.content
	});
	const theirs = url.search.replace(/^\?/, '');
	const existing = new URLSearchParams(theirs);
	if ([...ours.keys()].some((name) => existing.has(name))) {
		// Only then is the store's query re-serialised; otherwise it is kept byte for byte.
		for (const name of ours.keys()) existing.delete(name);
		const kept = existing.toString();
		url.search = kept ? `${kept}&${ours}` : ours.toString();
	} else {
		url.search = theirs ? `${theirs}&${ours}` : ours.toString();
	}
	return url.href;
}

/** A fresh random code: 8 characters from 57 unambiguous letters and digits (about 46 bits). */
export function newLinkCode(): string {
	const bytes = randomBytes(CODE_LENGTH * 2);
	let code = '';
	// Rejection sampling keeps every character equally likely (256 is not a multiple of 57).
	const limit = 256 - (256 % CODE_ALPHABET.length);
	for (const byte of bytes) {
		if (byte >= limit) continue;
		code += CODE_ALPHABET[byte % CODE_ALPHABET.length];
		if (code.length === CODE_LENGTH) return code;
	}
	return code.length === CODE_LENGTH ? code : newLinkCode();
}

export const isLinkCode = (code: string) => CODE_PATTERN.test(code);

/** The public address of a link: `${origin}/go/${code}`. */
export const linkAddress = (origin: string, code: string) =>
	`${origin.replace(/\/+$/, '')}/go/${code}`;

/**
 * Makes sure each (episode, part) pair has its tracked link; existing links keep their code (and
 * their clicks). Runs inside the caller's transaction when given one. The episode and the parts
 * must be the channel's (404 otherwise), so a link never joins two channels.
 */
export async function ensureTrackedLinks(
	channelId: string,
	episodeId: string,
	partIds: readonly string[],
	executor: Executor = db
): Promise<void> {
	let missing = [...new Set(partIds)];
	if (missing.length === 0) return;
	const inChannel = await executor
		.selectFrom('part')
		.innerJoin('episode', 'episode.channelId', 'part.channelId')
		.select('part.id')
		.where('episode.id', '=', episodeId)
		.where('part.channelId', '=', channelId)
		.where('part.id', 'in', missing)
		.execute();
	if (inChannel.length !== missing.length) throw notFound('That episode or part');
	for (let attempt = 0; attempt < 5 && missing.length > 0; attempt++) {
		// DO NOTHING covers both "this pair has a link" and the rare clash of a random code.
		await executor
			.insertInto('trackedLink')
			.values(missing.map((partId) => ({ code: newLinkCode(), episodeId, partId })))
			.onConflict((conflict) => conflict.doNothing())
			.execute();
		const present = await executor
			.selectFrom('trackedLink')
			.select('partId')
			.where('episodeId', '=', episodeId)
			.where('partId', 'in', missing)
			.execute();
		const found = new Set(present.map((row) => row.partId));
		missing = missing.filter((partId) => !found.has(partId));
	}
	if (missing.length > 0)
		throw new Error('could not make unique tracked link codes after 5 attempts');
}

export interface Redirect {
	location: string;
}

/**
 * Follows a link: the target address, and (for a GET) one more click today, in one statement.
 * Null when the code names no link. Days are UTC days.
 */
export async function followTrackedLink(
	code: string,
	options: { count: boolean },
	executor: Executor = db
): Promise<Redirect | null> {
	if (!isLinkCode(code)) return null;
	const result = await sql<{
		linkId: string;
		storeUrl: string;
		sku: string;
		slug: string;
		channelName: string;
	}>`
		WITH link AS (
			SELECT tracked_link.id AS link_id, part.store_url, part.sku, episode.slug, channel.name AS channel_name
			FROM tracked_link
			JOIN part ON part.id = tracked_link.part_id
			JOIN episode ON episode.id = tracked_link.episode_id
			JOIN channel ON channel.id = episode.channel_id
			WHERE tracked_link.code = ${code}
		), counted AS (
			INSERT INTO link_click_day (link_id, day, clicks)
			SELECT link_id, (now() AT TIME ZONE 'UTC')::date, 1 FROM link WHERE ${options.count}
			ON CONFLICT (link_id, day) DO UPDATE SET clicks = link_click_day.clicks + 1
		)
		SELECT * FROM link`.execute(executor);
	const row = result.rows[0];
	if (!row) return null;
	return {
		location: trackedUrl(row.storeUrl, {
			source: campaignSlug(row.channelName),
			campaign: row.slug,
			content: row.sku
		})
	};
}

export interface ClickDay {
	day: string;
	clicks: number;
}

export interface LinkClicks {
	linkId: string;
	code: string;
	address: string;
	target: string;
	partId: string;
	sku: string;
	name: string;
	total: number;
	/** One entry per day of the window, oldest first, zeros included. */
	days: ClickDay[];
}

export interface EpisodeClicks {
	from: string;
	to: string;
	links: LinkClicks[];
	/** Sum over every link per day of the window, oldest first. */
	days: ClickDay[];
	total: number;
	/** Every click ever counted on these links, the window's and earlier. */
	allTime: number;
}

/** The UTC dates from `days - 1` days ago to today, oldest first. */
export function dayWindow(days: number, today = new Date()): string[] {
	const end = Date.UTC(today.getUTCFullYear(), today.getUTCMonth(), today.getUTCDate());
	return Array.from({ length: days }, (_, index) =>
		new Date(end - (days - 1 - index) * 86_400_000).toISOString().slice(0, 10)
	);
}

/** Clicks per link per day for one episode of the channel, over the last `days` days; null when not found. */
export async function clicksFor(
	channelId: string,
	episodeId: string,
	options: { origin: string; days?: number },
	executor: Executor = db
): Promise<EpisodeClicks | null> {
	const window = dayWindow(options.days ?? CLICK_DAYS);
	const episode = await executor
		.selectFrom('episode')
		.innerJoin('channel', 'channel.id', 'episode.channelId')
		.select(['episode.id', 'episode.slug', 'channel.name as channelName'])
		.where('episode.id', '=', episodeId)
		.where('episode.channelId', '=', channelId)
		.executeTakeFirst();
	if (!episode) return null;
	const rows = await executor
		.selectFrom('trackedLink')
		.innerJoin('part', 'part.id', 'trackedLink.partId')
		.leftJoin('linkClickDay', 'linkClickDay.linkId', 'trackedLink.id')
		.select([
			'trackedLink.id',
			'trackedLink.code',
			'trackedLink.partId',
			'part.sku',
			'part.name',
			'part.storeUrl',
			'linkClickDay.day',
			'linkClickDay.clicks'
		])
		.where('trackedLink.episodeId', '=', episode.id)
		.orderBy('part.sku')
		.execute();
	const links = new Map<string, LinkClicks & { byDay: Map<string, number> }>();
	let allTime = 0;
	for (const row of rows) {
		let link = links.get(row.id);
		if (!link) {
			link = {
				linkId: row.id,
				code: row.code,
				address: linkAddress(options.origin, row.code),
				target: trackedUrl(row.storeUrl, {
					source: campaignSlug(episode.channelName),
					campaign: episode.slug,
					content: row.sku
				}),
				partId: row.partId,
				sku: row.sku,
				name: row.name,
				total: 0,
				days: [],
				byDay: new Map()
			};
			links.set(row.id, link);
		}
		if (row.day !== null && row.clicks !== null) {
			allTime += row.clicks;
			link.byDay.set(row.day, (link.byDay.get(row.day) ?? 0) + row.clicks);
		}
	}
	const inWindow = new Set(window);
	const result: LinkClicks[] = [...links.values()].map(({ byDay, ...link }) => ({
		...link,
		days: window.map((day) => ({ day, clicks: byDay.get(day) ?? 0 })),
		total: [...byDay].reduce((sum, [day, clicks]) => sum + (inWindow.has(day) ? clicks : 0), 0)
	}));
	result.sort((a, b) => b.total - a.total || a.sku.localeCompare(b.sku));
	const days = window.map((day, index) => ({
		day,
		clicks: result.reduce((sum, link) => sum + link.days[index].clicks, 0)
	}));
	return {
		from: window[0],
		to: window[window.length - 1],
		links: result,
		days,
		total: days.reduce((sum, day) => sum + day.clicks, 0),
		allTime
	};
}
