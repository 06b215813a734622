/**
 * A seeded fuzz of every JSON route and the main pages' form actions: no input, however hostile,
 * gets a 5xx (OWASP ASVS 4.0.3 V5: input validation; the database's limits are PostgreSQL's own).
 *
 * The routes are read from the file system (src/routes/api/**\/+server.ts and the exported
 * methods), so a new route is fuzzed without touching this file; a new path parameter makes this
 * test ask which table its ids come from. Everything that could change data runs in a channel made
 * for the purpose (its own producer, who has every role there), and that channel is removed at the
 * end: the demo producer only reads demo records and sends changes to ids that are not theirs.
 *
 * Set FUZZ_SEED to replay or explore (and FUZZ_SCALE to send more); the seed is printed with every
 * failure. The time limits are generous on purpose: this checks answers, not speed.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Visitor, baseUrl, demo, signedIn, sql } from '../helpers/http';
import { hostileObject, hostileString, hostileValue, mutated, notJson } from '../helpers/hostile';
import { HAZARD_IDS } from '$lib/cautions';
import { MEDIA_KINDS } from '$lib/media';
import { SEGMENT_KINDS } from '$lib/rundown';

const SEED = Number(process.env.FUZZ_SEED ?? 4_031_977);
/** FUZZ_SCALE=4 sends four times as many, to explore (the suite runs the default). */
const SCALE = Number(process.env.FUZZ_SCALE ?? 1);
const API_REQUESTS = Math.round(5_000 * SCALE);
const PAGE_REQUESTS = Math.round(800 * SCALE);
const IN_FLIGHT = 4;

const root = path.resolve(import.meta.dirname, '../..');
const FUZZ_EMAIL = 'fuzz.bench.producer@example.test';
const INVITE_DOMAIN = 'fuzz-invite.example.test';

// ---------------------------------------------------------------------------------------------
// Routes from the file system

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

interface Route {
	/** e.g. /api/episodes/[id]/chapters/[chapterId] */
	pattern: string;
	methods: Method[];
	/** For every [param], the kind of id it takes (a table, or 'hazard'). */
	params: { name: string; kind: string }[];
}

/** Which table a path parameter's ids come from, by the folder before it. */
const PARAM_KINDS: Record<string, string> = {
	'episodes/[id]': 'episode',
	'crew/[personId]': 'person',
	'chapters/[chapterId]': 'chapter',
	'spec-cards/[cardId]': 'spec_card',
	'footage/[footageId]': 'footage',
	'notes/[id]': 'segment_note',
	'parts/[id]': 'part',
	'pull-items/[id]': 'pull_item',
	'segments/[id]': 'segment',
	'shoot-days/[id]': 'shoot_day',
	'shots/[id]': 'shot',
	'takes/[id]': 'take',
	'tokens/[id]': 'api_token',
	'cautions/[hazard]': 'hazard',
	'media/[kind]': 'media_kind',
	'versions/[versionId]': 'cut_version',
	'comments/[commentId]': 'cut_comment',
	// pages
	'rundown/[segmentId]': 'segment',
	'script/[segmentId]': 'segment',
	'shoots/[id]': 'shoot_day',
	'builds/[id]': 'build'
};

function filesNamed(dir: string, name: string): string[] {
	return readdirSync(dir).flatMap((entry) => {
		const full = path.join(dir, entry);
		if (statSync(full).isDirectory()) return filesNamed(full, name);
		return entry === name ? [full] : [];
	});
}

function paramsOf(pattern: string): { name: string; kind: string }[] {
	const parts = pattern.split('/');
	return parts.flatMap((part, index) => {
		const match = /^\[(\w+)\]$/.exec(part);
		if (!match) return [];
		const key = `${parts[index - 1]}/${part}`;
		const kind = PARAM_KINDS[key];
		if (!kind)
			throw new Error(
				`The fuzz test does not know which ids ${key} (in ${pattern}) takes: add it to PARAM_KINDS.`
			);
		return [{ name: match[1], kind }];
	});
}

function apiRoutes(): Route[] {
	const dir = path.join(root, 'src/routes/api');
	return filesNamed(dir, '+server.ts')
		.map((file) => {
			const source = readFileSync(file, 'utf8');
			const methods = [...source.matchAll(/export const (GET|POST|PUT|PATCH|DELETE)\b/g)].map(
				(m) => m[1] as Method
			);
			const pattern = '/api/' + path.relative(dir, path.dirname(file)).split(path.sep).join('/');
			return { pattern: pattern.replace(/\/$/, ''), methods, params: paramsOf(pattern) };
		})
		.sort((a, b) => a.pattern.localeCompare(b.pattern));
}

interface Page {
	pattern: string;
	actions: string[];
	fields: string[];
	params: { name: string; kind: string }[];
}

/** The signed-in pages with their named actions and the form fields their code reads. */
function appPages(): Page[] {
	const dir = path.join(root, 'src/routes/(app)');
	return filesNamed(dir, '+page.server.ts').map((file) => {
		const source = readFileSync(file, 'utf8');
		const actionsAt = source.indexOf('export const actions');
		const actions =
			actionsAt < 0
				? []
				: [...source.slice(actionsAt).matchAll(/^\t(\w+): (?:async )?\(/gm)].map((m) => m[1]);
		const fields = new Set<string>();
		for (const m of source.matchAll(
			/(?:form(?:Data)?\.(?:get|getAll|has)\(|\b(?:text|number)\(form, )'([\w.-]+)'/g
		))
			fields.add(m[1]);
		const relative = path.relative(dir, path.dirname(file)).split(path.sep).join('/');
		const pattern = '/' + relative;
		return {
			pattern: pattern.replace(/\/$/, ''),
			actions,
			fields: [...fields],
			params: paramsOf(pattern)
		};
	});
}

// ---------------------------------------------------------------------------------------------
// The fuzz channel and its records

interface Row {
	id: string;
	/** The id of the record it belongs to (a chapter's episode, a caution's segment …). */
	parent?: string;
}
type Pools = Record<string, Row[]>;

/** Which kind a record's parent is, so nested paths name a real pair most of the time. */
const PARENT_KIND: Record<string, string> = {
	chapter: 'episode',
	spec_card: 'episode',
	segment_note: 'episode',
	segment: 'episode',
	hazard: 'segment',
	cut_version: 'episode',
	cut_comment: 'episode'
};

async function poolsFor(channelId: string, excludePerson: string): Promise<Pools> {
	const q = (text: string) => sql<Row>(text, [channelId]);
	return {
		episode: await q(`SELECT id FROM episode WHERE channel_id = $1`),
		segment: await q(
			`SELECT s.id, s.episode_id AS parent FROM segment s JOIN episode e ON e.id = s.episode_id WHERE e.channel_id = $1`
		),
		chapter: await q(
			`SELECT c.id, c.episode_id AS parent FROM chapter c JOIN episode e ON e.id = c.episode_id WHERE e.channel_id = $1`
		),
		spec_card: await q(
			`SELECT c.id, c.episode_id AS parent FROM spec_card c JOIN episode e ON e.id = c.episode_id WHERE e.channel_id = $1`
		),
		segment_note: await q(
			`SELECT n.id, n.episode_id AS parent FROM segment_note n JOIN episode e ON e.id = n.episode_id WHERE e.channel_id = $1`
		),
		shot: await q(
			`SELECT sh.id FROM shot sh JOIN segment s ON s.id = sh.segment_id JOIN episode e ON e.id = s.episode_id WHERE e.channel_id = $1`
		),
		take: await q(
			`SELECT t.id FROM take t JOIN shot sh ON sh.id = t.shot_id JOIN segment s ON s.id = sh.segment_id JOIN episode e ON e.id = s.episode_id WHERE e.channel_id = $1`
		),
		hazard: [
			...(await q(
				`SELECT c.hazard AS id, c.segment_id AS parent FROM caution c JOIN segment s ON s.id = c.segment_id JOIN episode e ON e.id = s.episode_id WHERE e.channel_id = $1`
			)),
			...HAZARD_IDS.map((id) => ({ id }))
		],
		media_kind: MEDIA_KINDS.map((id) => ({ id })),
		part: await q(`SELECT id FROM part WHERE channel_id = $1`),
		shoot_day: await q(`SELECT id FROM shoot_day WHERE channel_id = $1`),
		pull_item: await q(
			`SELECT p.id FROM pull_item p JOIN shoot_day d ON d.id = p.shoot_day_id WHERE d.channel_id = $1`
		),
		day_item: await q(
			`SELECT c.id FROM shoot_day_camera c JOIN shoot_day d ON d.id = c.shoot_day_id WHERE d.channel_id = $1
			 UNION ALL SELECT g.id FROM gear_item g JOIN shoot_day d ON d.id = g.shoot_day_id WHERE d.channel_id = $1`
		),
		footage: await q(`SELECT id FROM footage WHERE channel_id = $1`),
		cut_version: await q(
			`SELECT v.id, v.episode_id AS parent FROM cut_version v JOIN episode e ON e.id = v.episode_id WHERE e.channel_id = $1`
		),
		cut_comment: await q(
			`SELECT c.id, c.episode_id AS parent FROM cut_comment c JOIN episode e ON e.id = c.episode_id WHERE e.channel_id = $1`
		),
		api_token: await q(`SELECT id FROM api_token WHERE channel_id = $1`),
		build: await q(`SELECT id FROM build WHERE channel_id = $1`),
		recording_profile: await q(`SELECT id FROM recording_profile WHERE channel_id = $1`),
		person: (await q(`SELECT person_id AS id FROM membership WHERE channel_id = $1`)).filter(
			(row) => row.id !== excludePerson
		)
	};
}

/** Ids that are no record of anybody's: malformed, empty, encoded NUL and broken UTF-8, far too long. */
const BAD_IDS = [
	'not-a-uuid',
	'00000000-0000-0000-0000-000000000000',
	'a3c5e2f0-9b1d-4c7e-8f2a-6d4b1e9c0f37',
	'%00',
	'%ED%A0%80',
	'%E2%80%AE',
	'2147483648',
	'-1',
	'..%2F..%2Fetc',
	'x'.repeat(300),
	'raised-vehicle'
];

interface World {
	fuzz: Visitor;
	token: string;
	demo: Visitor;
	channelId: string;
	personId: string;
	fuzzPools: Pools;
	demoPools: Pools;
}

async function expectStatus(
	response: Promise<{ status: number; body: unknown }>,
	status: number,
	what: string
) {
	const result = await response;
	if (result.status !== status)
		throw new Error(`setup: ${what} answered ${result.status}: ${JSON.stringify(result.body)}`);
	return result.body as any;
}

async function buildWorld(): Promise<World> {
	const [channel] = await sql<{ id: string }>(
		`INSERT INTO channel (name, frame_rate) VALUES ('Zz fuzz bench', '29.97') RETURNING id`
	);
	const [person] = await sql<{ id: string }>(
		`INSERT INTO person (email, name, password_hash)
		 SELECT $1, 'Fuzz Bench Producer', password_hash FROM person WHERE email = $2 RETURNING id`,
		[FUZZ_EMAIL, demo.producer]
	);
	await sql(
		`INSERT INTO membership (channel_id, person_id, roles)
		 VALUES ($1, $2, ARRAY['producer','host','camera','editor','merch'])`,
		[channel.id, person.id]
	);
	await sql(
		`INSERT INTO build (channel_id, name, year, vehicle_type, drivetrain, front_suspension, rear_suspension, tyre_size)
		 VALUES ($1, 'Bench mule', 2004, 'Midsize pickup', 'Part-time 4WD', 'Independent, coil', 'Solid axle, leaf', '265/70R17')`,
		[channel.id]
	);
	await sql(
		`INSERT INTO recording_profile (channel_id, name, camera, codec, resolution, frame_rate, bitrate_mbps)
		 VALUES ($1, 'Bench A cam', 'Body A', 'H.265 10-bit', '3840x2160', '29.97', 100)`,
		[channel.id]
	);

	const fuzz = await signedIn(FUZZ_EMAIL);
	const me = await expectStatus(fuzz.api('/api/me'), 200, 'who am I');
	if (me.channel.id !== channel.id)
		throw new Error('setup: the fuzz producer is in the wrong channel');

	const part = (sku: string) =>
		expectStatus(
			fuzz.api('/api/parts', {
				method: 'POST',
				json: {
					sku,
					name: 'Bench jack stand',
					category: 'Lifting',
					brand: 'Benchmark Tools',
					price: '49.00',
					storeUrl: `https://shop.example.test/p/${sku}`
				}
			}),
			201,
			'a part'
		);
	const parts = [(await part('FZ-1')).part.id, (await part('FZ-2')).part.id];

	const episodes: string[] = [];
	for (const title of ['Bench episode one', 'Bench episode two']) {
		const { episode } = await expectStatus(
			fuzz.api('/api/episodes', {
				method: 'POST',
				json: {
					title,
					targetRuntimeSeconds: '12:00',
					frameRate: '29.97',
					publishDate: '2027-03-01',
					assignments: { host: person.id, camera: person.id, editor: person.id, merch: person.id }
				}
			}),
			201,
			'an episode'
		);
		episodes.push(episode.id);
	}
	for (const episodeId of episodes) {
		for (const [index, kind] of SEGMENT_KINDS.slice(0, 3).entries()) {
			const { segment } = await expectStatus(
				fuzz.api(`/api/episodes/${episodeId}/segments`, {
					method: 'POST',
					json: {
						kind,
						title: `Bench segment ${index + 1}`,
						plannedSeconds: '1:30',
						hazards: index === 1 ? [HAZARD_IDS[0]] : []
					}
				}),
				201,
				'a segment'
			);
			const { shot } = await expectStatus(
				fuzz.api(`/api/segments/${segment.id}/shots`, {
					method: 'POST',
					json: { what: 'Wide of the bay', camera: 'A cam' }
				}),
				201,
				'a shot'
			);
			await expectStatus(
				fuzz.api(`/api/shots/${shot.id}/takes`, {
					method: 'POST',
					json: { clipName: 'ACAM_1001', sourceIn: '01:00:00;00', sourceOut: '01:00:10;00' }
				}),
				201,
				'a take'
			);
			await expectStatus(
				fuzz.api(`/api/episodes/${episodeId}/notes`, {
					method: 'POST',
					json: { text: 'Caliper bolt close-up', segmentId: segment.id, partIds: [parts[0]] }
				}),
				201,
				'a note'
			);
		}
		await expectStatus(
			fuzz.api(`/api/episodes/${episodeId}/cut`, { method: 'PATCH', json: { duration: '12:00' } }),
			200,
			'the cut'
		);
		for (const [start, title] of [
			['0:00', 'Intro'],
			['1:00', 'Teardown'],
			['4:00', 'Install']
		])
			await expectStatus(
				fuzz.api(`/api/episodes/${episodeId}/chapters`, { method: 'POST', json: { start, title } }),
				201,
				'a chapter'
			);
		await expectStatus(
			fuzz.api(`/api/episodes/${episodeId}/spec-cards`, {
				method: 'POST',
				json: { input: { kind: 'tyre', size: '285/70R17' }, at: '0:10' }
			}),
			201,
			'a spec card'
		);
		const { shootDay } = await expectStatus(
			fuzz.api('/api/shoot-days', {
				method: 'POST',
				json: {
					episodeId,
					shootDate: '2027-04-12',
					locationName: 'Bay 3',
					callTime: '07:30',
					wrapTime: '16:00'
				}
			}),
			201,
			'a shoot day'
		);
		await sql(
			`INSERT INTO pull_item (shoot_day_id, part_id, label, quantity) VALUES ($1, $2, 'Jack stands', 2), ($1, NULL, 'Shop rags', 1)`,
			[shootDay.id, parts[0]]
		);
		await sql(
			`INSERT INTO gear_item (shoot_day_id, kind, label, quantity) VALUES ($1, 'light', 'Work light', 2)`,
			[shootDay.id]
		);
	}
	await expectStatus(
		fuzz.api('/api/crew', {
			method: 'POST',
			json: { email: `bench.host@${INVITE_DOMAIN}`, name: 'Bench Host', roles: ['host'] }
		}),
		201,
		'an invite'
	);
	const { token } = await expectStatus(
		fuzz.api('/api/tokens', { method: 'POST', json: { label: 'fuzz bench' } }),
		201,
		'a token'
	);

	const demoVisitor = await signedIn(demo.producer);
	const [demoMember] = await sql<{ channel_id: string; person_id: string }>(
		`SELECT m.channel_id, m.person_id FROM membership m JOIN person p ON p.id = m.person_id WHERE p.email = $1`,
		[demo.producer]
	);
	return {
		fuzz,
		token: token.token,
		demo: demoVisitor,
		channelId: channel.id,
		personId: person.id,
		fuzzPools: await poolsFor(channel.id, person.id),
		demoPools: await poolsFor(demoMember.channel_id, demoMember.person_id)
	};
}

async function removeWorld(world: World | undefined) {
	if (!world) return;
	const parts = `SELECT id FROM part WHERE channel_id = $1`;
	await sql(`DELETE FROM segment_note_part WHERE part_id IN (${parts})`, [world.channelId]);
	await sql(`DELETE FROM tracked_link WHERE part_id IN (${parts})`, [world.channelId]);
	await sql(
		`DELETE FROM shoot_day_camera WHERE shoot_day_id IN (SELECT id FROM shoot_day WHERE channel_id = $1)`,
		[world.channelId]
	);
	await sql(`DELETE FROM channel WHERE id = $1`, [world.channelId]);
	await sql(
		`DELETE FROM person p WHERE (p.email = $1 OR p.email LIKE $2)
		 AND NOT EXISTS (SELECT 1 FROM membership m WHERE m.person_id = p.id)
		 AND NOT EXISTS (SELECT 1 FROM upload u WHERE u.person_id = p.id)`,
		[FUZZ_EMAIL, `%@${INVITE_DOMAIN}`]
	);
}

/** Tables whose rows the fuzz must leave as it found them (sessions, mail and sign-in failures may grow). */
const KEPT_TABLES = [
	'channel',
	'person',
	'membership',
	'api_token',
	'build',
	'part',
	'episode',
	'episode_build',
	'episode_assignment',
	'segment',
	'segment_script',
	'caution',
	'shot',
	'take',
	'stage_move',
	'script_review',
	'chapter',
	'recording_profile',
	'shoot_day',
	'shoot_day_crew',
	'shoot_day_build',
	'shoot_day_camera',
	'gear_item',
	'pull_item',
	'upload',
	'footage',
	'shoot_day_segment',
	'segment_note',
	'segment_note_part',
	'tracked_link',
	'link_click_day',
	'spec_card'
];

/** Every kept table's rows, reduced to a fingerprint: equal before and after means nothing changed. */
async function snapshot(): Promise<Record<string, string>> {
	const prints: Record<string, string> = {};
	for (const table of KEPT_TABLES) {
		const [row] = await sql<{ print: string | null; n: number }>(
			`SELECT count(*)::int AS n, md5(string_agg(t::text, ',' ORDER BY t::text)) AS print FROM ${table} t`
		);
		prints[table] = `${row.n} rows, ${row.print ?? 'empty'}`;
	}
	return prints;
}

// ---------------------------------------------------------------------------------------------
// Valid bodies, for the fuzz to bend

type Ids = { pick: (kind: string) => string; version: () => number };

const VALID_BODIES: Record<string, (ids: Ids, n: number) => unknown> = {
	'PATCH /api/channel': (ids) => ({
		name: 'Zz fuzz bench',
		frameRate: '29.97',
		callToAction: 'Parts are linked below.',
		contact: 'bench@example.test',
		descriptionLimit: 5000,
		version: ids.version()
	}),
	'POST /api/crew': (_, n) => ({
		email: `person${n}@${INVITE_DOMAIN}`,
		name: 'Bench Camera',
		roles: ['camera']
	}),
	'PATCH /api/crew/[personId]': () => ({ roles: ['host', 'camera'], disabled: false }),
	'POST /api/episodes': (ids) => ({
		title: 'Bench episode',
		slug: 'bench-episode',
		logline: 'A leaf-spring swap on the bench mule.',
		targetRuntimeSeconds: '12:00',
		frameRate: '29.97',
		publishDate: '2027-05-01',
		buildIds: [ids.pick('build')],
		assignments: { host: ids.pick('person'), editor: null }
	}),
	'PATCH /api/episodes/[id]': (ids) => ({
		title: 'Bench episode renamed',
		publishDate: '2027-06-01',
		targetRuntimeSeconds: 900,
		version: ids.version()
	}),
	'POST /api/episodes/[id]/chapters': (ids) => ({
		start: '2:00',
		title: 'Torque sequence',
		url: 'https://shop.example.test/p/FZ-1',
		partId: ids.pick('part')
	}),
	'PATCH /api/episodes/[id]/chapters/[chapterId]': (ids) => ({
		version: ids.version(),
		startFrame: 1800,
		title: 'Teardown'
	}),
	'PATCH /api/episodes/[id]/cut': () => ({ duration: '00:12:00;00', expectedFrames: 21_578 }),
	'POST /api/episodes/[id]/notes': (ids) => ({
		text: 'Torque wrench close-up',
		segmentId: ids.pick('segment'),
		takeId: ids.pick('take'),
		sourceTime: '01:00:04;00',
		programTime: '4:05',
		partIds: [ids.pick('part')]
	}),
	'POST /api/episodes/[id]/script-preview': () => ({ markdown: '## Lift\nSupport it on stands.' }),
	'POST /api/episodes/[id]/script-review': (ids) => ({
		action: 'comment',
		body: 'Tighten the intro.',
		segmentId: ids.pick('segment')
	}),
	'POST /api/episodes/[id]/segments': (ids) => ({
		kind: SEGMENT_KINDS[3],
		title: 'Bolt check',
		plannedSeconds: '1:30',
		buildId: ids.pick('build'),
		needsFootage: true,
		hazards: [HAZARD_IDS[0]],
		promiseEpisodeId: ids.pick('episode'),
		promiseTitle: 'Next week'
	}),
	'PUT /api/episodes/[id]/segments/order': (ids) => ({
		order: [ids.pick('segment'), ids.pick('segment'), ids.pick('segment')]
	}),
	'POST /api/episodes/[id]/spec-cards': (ids) => ({
		input: { kind: 'torque', value: 95, unit: 'ft·lbf', fastener: 'Lug nut' },
		at: '0:20',
		durationSeconds: 6,
		segmentId: ids.pick('segment')
	}),
	'PATCH /api/episodes/[id]/spec-cards/[cardId]': (ids) => ({
		version: ids.version(),
		input: {
			kind: 'lift',
			frontLiftIn: 2,
			rearLiftIn: 3,
			frontSuspension: 'coil',
			rearSuspension: 'leaf',
			method: { front: null, rear: null }
		},
		durationSeconds: 45,
		atFrame: 300
	}),
	'POST /api/episodes/[id]/stage': () => ({ from: 'script', to: 'shoot', note: 'Ready.' }),
	'PATCH /api/notes/[id]': (ids) => ({
		version: ids.version(),
		text: 'Torque wrench close-up',
		programTime: '0:20',
		partIds: [ids.pick('part')]
	}),
	'POST /api/parts': (_, n) => ({
		sku: `FZ-${n}`,
		name: 'Bench jack stand',
		category: 'Lifting',
		brand: 'Benchmark Tools',
		price: '1,299.00',
		currency: 'usd',
		storeUrl: `https://shop.example.test/p/${n}`,
		fitmentNote: 'Fits most midsize pickups.',
		status: 'active'
	}),
	'PATCH /api/parts/[id]': (ids) => ({
		version: ids.version(),
		price: 12.5,
		status: 'out of stock'
	}),
	'POST /api/parts/import': () => ({
		action: 'preview',
		mode: 'create',
		csv: 'sku,name,category,brand,price,store url\nFZ-9,Shackle,Suspension,Benchmark Tools,19.99,https://shop.example.test/p/9\n',
		mapping: { storeUrl: 'store url' }
	}),
	'PATCH /api/pull-items/[id]': (ids) => ({ onHand: true, version: ids.version() }),
	'PATCH /api/segments/[id]': (ids) => ({
		version: ids.version(),
		title: 'Bolt check',
		plannedSeconds: 95,
		recorded: '1:32',
		hazards: [HAZARD_IDS[1]]
	}),
	'DELETE /api/segments/[id]': (ids) => ({ version: ids.version() }),
	'PATCH /api/segments/[id]/cautions/[hazard]': (ids) => ({
		text: 'Support the vehicle on rated stands.',
		at: '0:05',
		version: ids.version()
	}),
	'PATCH /api/segments/[id]/span': (ids) => ({
		in: '0:05',
		out: '1:10',
		version: ids.version()
	}),
	'PUT /api/segments/[id]/script': (ids) => ({
		body: 'Crack the lugs before you lift.',
		version: ids.version()
	}),
	'POST /api/segments/[id]/shots': () => ({
		what: 'Close-up of the shackle',
		angle: 'low',
		roll: 'B',
		camera: 'B cam',
		notes: 'Use the macro.'
	}),
	'POST /api/shoot-days': (ids) => ({
		episodeId: ids.pick('episode'),
		shootDate: '2027-04-13',
		locationName: 'Bay 3',
		locationAddress: '1 Bench Road',
		bay: '3',
		bayFrom: '07:00',
		bayUntil: '17:00',
		callTime: '07:30',
		wrapTime: '16:00',
		notes: 'Bring the long bar.'
	}),
	'PATCH /api/shoot-days/[id]': (ids) => ({
		shootDate: '2027-04-14',
		locationName: 'Bay 4',
		locationAddress: '',
		bay: '4',
		callTime: '08:00',
		wrapTime: '15:00',
		notes: '',
		version: ids.version()
	}),
	'POST /api/shots/[id]/takes': () => ({
		clipName: 'ACAM_2007',
		sourceIn: '01:02:00;00',
		sourceOut: '01:02:30;00',
		good: true,
		note: 'Keeper.',
		footageId: ''
	}),
	'PATCH /api/takes/[id]': (ids) => ({ good: false, note: 'Soft focus.', version: ids.version() }),
	'POST /api/tokens': () => ({ label: 'graphics laptop' })
};

/** Every field name the valid bodies use, for bodies of routes without one and extra fields. */
const FIELD_NAMES = [
	...new Set(
		Object.values(VALID_BODIES).flatMap((make) => {
			const body = make({ pick: () => 'x', version: () => 1 }, 0);
			return body && typeof body === 'object' ? Object.keys(body) : [];
		})
	)
];

const QUERY_VALUES: Record<string, readonly string[]> = {
	format: ['txt', 'vtt', 'ffmetadata', 'json', 'csv', 'md'],
	days: ['30', '366', '0', '2147483648'],
	version: ['1', '2', '2147483648', '-1', '1.5'],
	q: ['jack', 'FZ'],
	category: ['Lifting'],
	status: ['active', 'discontinued', 'out_of_stock'],
	sort: ['sku', 'price', 'publish', 'title', 'created', 'clip'],
	dir: ['asc', 'desc'],
	direction: ['asc', 'desc'],
	page: ['1', '2', '100000', '2147483648'],
	pageSize: ['10', '100', '101'],
	stage: ['script', 'shoot', 'edit'],
	assignee: ['00000000-0000-0000-0000-000000000000'],
	from: ['2027-01-01', '2027-02-31', '0000-01-01'],
	to: ['2027-12-31', '2027-02-30', '9999-12-31'],
	shootDay: ['00000000-0000-0000-0000-000000000000', 'not-a-uuid'],
	camera: ['A cam'],
	purpose: ['footage', 'cut'],
	download: ['1'],
	action: ['preview', 'commit'],
	mode: ['create', 'update'],
	edit: ['00000000-0000-0000-0000-000000000000']
};

/** Percent-encodes any string, a lone surrogate included (as the broken UTF-8 it would be). */
function encode(text: string): string {
	return [...text]
		.map((char) => {
			try {
				return encodeURIComponent(char);
			} catch {
				return '%ED%A0%80';
			}
		})
		.join('');
}

// ---------------------------------------------------------------------------------------------
// Requests

type Caller = 'fuzz' | 'token' | 'demo';
type Body =
	| { kind: 'none' }
	| { kind: 'json'; value: unknown }
	| { kind: 'raw'; text: string; type: string | null };

interface FuzzRequest {
	caller: Caller;
	method: Method;
	/** The route or page pattern the request was made for, for the report. */
	pattern: string;
	url: string;
	body: Body;
	/** A form action: the fields posted. */
	form?: Record<string, string[]>;
}

type G = fc.GeneratorValue;

function pickRow(g: G, pools: Pools, kind: string): Row | undefined {
	const rows = pools[kind] ?? [];
	return rows.length ? rows[g(fc.nat, rows.length - 1)] : undefined;
}

/** Fills a pattern's params: mostly real ids of the caller's pools (parents matching), else bad or foreign ones. */
function fillParams(
	g: G,
	pattern: string,
	params: Route['params'],
	pools: Pools,
	foreign: Pools,
	realShare: number
): { path: string; ids: Record<string, string> } {
	const ids: Record<string, string> = {};
	for (let index = params.length - 1; index >= 0; index -= 1) {
		const { name, kind } = params[index];
		if (ids[name] !== undefined) continue;
		const roll = g(fc.double, { min: 0, max: 1, noNaN: true });
		let row: Row | undefined;
		if (roll < realShare) row = pickRow(g, pools, kind);
		else if (roll < realShare + (1 - realShare) / 2) row = pickRow(g, foreign, kind);
		if (!row) {
			ids[name] = g(fc.constantFrom, ...BAD_IDS);
			continue;
		}
		ids[name] = encode(row.id);
		const parent = params[index - 1];
		if (row.parent && parent && PARENT_KIND[kind] === parent.kind && g(fc.nat, 9) < 8)
			ids[parent.name] = row.parent;
	}
	const path = pattern.replace(/\[(\w+)\]/g, (_, name: string) => ids[name]);
	return { path, ids };
}

function queryString(g: G): string {
	if (g(fc.nat, 9) < 5) return '';
	const keys = g(() =>
		fc.uniqueArray(fc.constantFrom(...Object.keys(QUERY_VALUES)), { minLength: 1, maxLength: 3 })
	);
	const pairs = keys.map((key) => {
		const value = g(() =>
			fc.oneof(
				fc.constantFrom(...QUERY_VALUES[key]),
				hostileString.filter((s) => s.length < 2_000)
			)
		);
		return `${encode(key)}=${encode(value)}`;
	});
	return '?' + pairs.join('&');
}

function apiRequest(g: G, routes: Route[], world: World, n: number): FuzzRequest {
	const route = g(fc.constantFrom, ...routes);
	const method = g(fc.constantFrom, ...route.methods);
	const roll = g(fc.nat, 99);
	// The demo producer reads demo records; it changes nothing but ids that are not theirs.
	const caller: Caller =
		roll < 12 && (method === 'GET' || route.params.length > 0)
			? 'demo'
			: roll < 30
				? 'token'
				: 'fuzz';
	const pools = caller === 'demo' ? world.demoPools : world.fuzzPools;
	const foreign = caller === 'demo' ? world.fuzzPools : world.demoPools;
	const realShare = caller === 'demo' && method !== 'GET' ? 0 : 0.85;
	const { path } = fillParams(g, route.pattern, route.params, pools, foreign, realShare);
	const safeForeign = caller === 'demo' && method !== 'GET' ? world.fuzzPools : pools;
	const ids: Ids = {
		pick: (kind) => pickRow(g, safeForeign, kind)?.id ?? '00000000-0000-0000-0000-000000000000',
		// Records start at version 1 and the fuzz saves some of them a few times.
		version: () => 1 + g(fc.nat, 3)
	};
	let body: Body = { kind: 'none' };
	if (method !== 'GET') {
		const valid = VALID_BODIES[`${method} ${route.pattern}`]?.(ids, n);
		const shape = g(fc.nat, 99);
		if (shape < 8) body = { kind: 'raw', text: g(() => notJson), type: 'application/json' };
		else if (shape < 12)
			body = {
				kind: 'raw',
				text: g(() => hostileString),
				type: g(fc.constantFrom, 'text/csv', null)
			};
		else if (shape < 20) body = { kind: 'json', value: g(() => hostileValue) };
		else if (shape < 35 || valid === undefined)
			body = { kind: 'json', value: g(() => hostileObject(FIELD_NAMES)) };
		else if (shape < 45) body = { kind: 'json', value: valid };
		else body = { kind: 'json', value: g(() => mutated(valid, FIELD_NAMES)) };
	}
	return { caller, method, pattern: route.pattern, url: path + queryString(g), body };
}

/** What a form field may carry: an id from the pools for fields that name records, else text. */
const FIELD_KINDS: Record<string, string[]> = {
	noteId: ['segment_note'],
	chapterId: ['chapter'],
	personId: ['person'],
	partId: ['part'],
	partIds: ['part'],
	segmentId: ['segment'],
	takeId: ['take'],
	episodeId: ['episode'],
	profileId: ['recording_profile'],
	buildId: ['build'],
	buildIds: ['build'],
	ids: ['person', 'build', 'segment'],
	id: ['pull_item', 'day_item', 'api_token'],
	cardId: ['spec_card']
};

function pageRequest(g: G, pages: Page[], world: World): FuzzRequest {
	const page = g(fc.constantFrom, ...pages);
	const { path } = fillParams(g, page.pattern, page.params, world.fuzzPools, world.demoPools, 0.85);
	const action =
		page.actions.length && g(fc.nat, 9) < 8 ? g(fc.constantFrom, ...page.actions) : null;
	if (!action)
		return {
			caller: 'fuzz',
			method: 'GET',
			pattern: page.pattern,
			url: path + queryString(g),
			body: { kind: 'none' }
		};
	const names = [
		...new Set([...page.fields, ...g(() => fc.subarray(FIELD_NAMES, { maxLength: 6 }))])
	];
	const form: Record<string, string[]> = {};
	for (const name of names) {
		if (g(fc.nat, 9) < 2) continue;
		const kinds = FIELD_KINDS[name];
		const count = g(fc.nat, 9) < 8 ? 1 : g(fc.nat, 3);
		form[name] = Array.from({ length: count }, () => {
			if (kinds && g(fc.nat, 9) < 6) {
				const row = pickRow(g, world.fuzzPools, g(fc.constantFrom, ...kinds));
				if (row) return row.id;
			}
			const value = g(() => fc.oneof(hostileValue, fc.constantFrom('1', '2', 'true', '')));
			return typeof value === 'string' ? value : (JSON.stringify(value) ?? '');
		});
	}
	// A page's only action is its default one, posted to the page itself.
	const target = action === 'default' ? '' : `?/${action}`;
	return {
		caller: 'fuzz',
		method: 'POST',
		pattern: page.pattern + target,
		url: path + target,
		body: { kind: 'none' },
		form
	};
}

/** Changes that remove records go last, so the rest of the run still finds them. */
const removes = (request: FuzzRequest) =>
	request.method === 'DELETE' ||
	/\?\/(delete|remove\w*|revokeToken|deleteTake|retire)$/.test(request.url);

interface Outcome {
	request: FuzzRequest;
	status: number;
	answer: string;
	ms: number;
}

/** Sends a request; a connection dropped before any answer is tried once more on a new one. */
async function send(world: World, request: FuzzRequest): Promise<Outcome> {
	const first = await sendOnce(world, request);
	return first.status === 599 ? sendOnce(world, request) : first;
}

async function sendOnce(world: World, request: FuzzRequest): Promise<Outcome> {
	const visitor = request.caller === 'demo' ? world.demo : world.fuzz;
	const headers: Record<string, string> = {};
	if (request.caller === 'token') headers.authorization = `Bearer ${world.token}`;
	const init: RequestInit & { json?: unknown; form?: Record<string, string[]> } = {
		method: request.method,
		headers,
		signal: AbortSignal.timeout(30_000)
	};
	if (request.form) {
		init.form = request.form;
		headers.accept = 'application/json';
		headers['x-sveltekit-action'] = 'true';
	} else if (request.body.kind === 'json') init.json = request.body.value;
	else if (request.body.kind === 'raw') {
		init.body = request.body.text;
		if (request.body.type) headers['content-type'] = request.body.type;
	}
	const started = performance.now();
	try {
		const response =
			request.caller === 'token'
				? await fetch(baseUrl() + request.url, {
						...init,
						body: init.json !== undefined ? JSON.stringify(init.json) : init.body,
						headers: {
							...headers,
							...(init.json !== undefined ? { 'content-type': 'application/json' } : {})
						},
						redirect: 'manual'
					})
				: await visitor.request(request.url, init);
		const answer = await response.text();
		let status = response.status;
		// A form action's failure travels in a 200 JSON envelope; an error inside it is what counts.
		if (request.form && status < 500) {
			try {
				const envelope = JSON.parse(answer);
				if (envelope.type === 'error' && (envelope.status ?? status) >= 500)
					status = envelope.status ?? 500;
			} catch {
				// not JSON: the status stands
			}
		}
		return { request, status, answer: answer.slice(0, 300), ms: performance.now() - started };
	} catch (failure) {
		return {
			request,
			status: 599,
			answer: `no answer: ${String(failure)} ${String((failure as Error).cause ?? '')}`,
			ms: performance.now() - started
		};
	}
}

async function runAll(world: World, requests: FuzzRequest[]): Promise<Outcome[]> {
	const ordered = [...requests.filter((r) => !removes(r)), ...requests.filter(removes)];
	const outcomes: Outcome[] = [];
	let next = 0;
	await Promise.all(
		Array.from({ length: IN_FLIGHT }, async () => {
			while (next < ordered.length) {
				const request = ordered[next++];
				outcomes.push(await send(world, request));
			}
		})
	);
	if (process.env.FUZZ_TIMING) {
		const byRoute = new Map<string, number[]>();
		for (const o of outcomes) {
			const key = `${o.request.method} ${o.request.pattern}`;
			byRoute.set(key, [...(byRoute.get(key) ?? []), o.ms]);
		}
		const rows = [...byRoute].map(
			([key, ms]) => [key, ms.length, ms.reduce((a, b) => a + b, 0), Math.max(...ms)] as const
		);
		rows.sort((a, b) => b[2] - a[2]);
		console.log(
			rows
				.slice(0, 25)
				.map((r) => `${r[0]} n=${r[1]} total=${r[2].toFixed(0)} max=${r[3].toFixed(0)}`)
				.join('\n')
		);
	}
	return outcomes;
}

const shown = (value: unknown) => {
	const text = typeof value === 'string' ? value : JSON.stringify(value);
	return text === undefined
		? 'undefined'
		: text.length > 240
			? `${text.slice(0, 240)}… (${text.length} chars)`
			: text;
};

function report(title: string, outcomes: Outcome[]): string {
	const failures = outcomes.filter((o) => o.status >= 500);
	if (failures.length === 0) return '';
	const lines = [
		`${failures.length} of ${outcomes.length} ${title} answered 5xx (seed ${SEED}; replay with FUZZ_SEED=${SEED}):`
	];
	for (const { request, status, answer } of failures.slice(0, 60)) {
		const sent =
			request.form ??
			(request.body.kind === 'json'
				? request.body.value
				: request.body.kind === 'raw'
					? request.body.text
					: '');
		lines.push(
			`  ${status} ${request.method} ${request.pattern} as ${request.caller}`,
			`      url:  ${shown(request.url)}`,
			`      body: ${shown(sent)}`,
			`      answer: ${shown(answer)}`
		);
	}
	if (failures.length > 60) lines.push(`  … and ${failures.length - 60} more`);
	return lines.join('\n');
}

// ---------------------------------------------------------------------------------------------

describe('fuzzing every JSON route and form action', () => {
	let world: World | undefined;
	let before: Record<string, string> = {};
	beforeAll(async () => {
		before = await snapshot();
		world = await buildWorld();
	});
	afterAll(async () => {
		await removeWorld(world);
		// The files after this one rely on the demo data: the fuzz leaves every row as it found it.
		expect(await snapshot()).toEqual(before);
	});

	test('every route under src/routes/api is found, with the methods it exports', () => {
		const routes = apiRoutes();
		expect(routes.length).toBeGreaterThan(30);
		const episodes = routes.find((route) => route.pattern === '/api/episodes/[id]');
		expect(episodes?.methods.sort()).toEqual(['GET', 'PATCH']);
		expect(routes.every((route) => route.methods.length > 0)).toBe(true);
	});

	test(`${API_REQUESTS} seeded hostile requests to the JSON routes get no 5xx`, async () => {
		const routes = apiRoutes();
		const generators = fc.sample(fc.gen(), { seed: SEED, numRuns: API_REQUESTS });
		const requests = generators.map((g, n) => apiRequest(g, routes, world!, n));
		const outcomes = await runAll(world!, requests);
		expect(outcomes).toHaveLength(API_REQUESTS);
		// Most requests are refused (4xx); some get through (2xx): both are answers, not crashes.
		expect(outcomes.filter((o) => o.status < 300).length).toBeGreaterThan(API_REQUESTS / 20);
		expect(report('requests', outcomes)).toBe('');
	}, 600_000);

	test(`${PAGE_REQUESTS} seeded hostile form posts and page loads get no 5xx`, async () => {
		const pages = appPages().filter((page) => page.actions.length > 0 || page.params.length > 0);
		expect(pages.length).toBeGreaterThan(15);
		const generators = fc.sample(fc.gen(), { seed: SEED + 1, numRuns: PAGE_REQUESTS });
		const requests = generators.map((g) => pageRequest(g, pages, world!));
		const outcomes = await runAll(world!, requests);
		expect(outcomes).toHaveLength(PAGE_REQUESTS);
		expect(report('form posts and page loads', outcomes)).toBe('');
	}, 600_000);
});
