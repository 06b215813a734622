/**
 * Input the database cannot store is refused beside its field (400) and nothing saved changes;
 * it never reaches PostgreSQL to come back as a 500. The limits are PostgreSQL's own, from its
 * manual: "Character Types" (text cannot hold the character with code zero), "Numeric Types"
 * (`integer` runs from −2147483648 to +2147483647) and "Date/Time Types" (`date` is a day of the
 * Gregorian calendar, and there is no year 0). Which days exist is checked as `Date.UTC` counts them.
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';
import {
	DATE_YEARS,
	INT_MAX,
	INT_MIN,
	dateProblem,
	textProblem,
	wholeNumber
} from '$lib/schemas/fields';

const NUL = '\u0000';
const TOO_BIG = 2 ** 31; // one past the largest PostgreSQL integer
const SLUG = `stored-input-${Date.now()}`;

let producer: Visitor;
let episodeId = '';
let segment: { id: string; version: number; script: { version: number } };
let shotId = '';
let shootDayId = '';

/** The demo producer's channel: records of other channels would answer 404 whatever the body. */
const OWN_CHANNEL = `(SELECT m.channel_id FROM membership m JOIN person p ON p.id = m.person_id WHERE p.email = '${demo.producer}')`;

const count = async (table: string) =>
	Number((await sql(`SELECT count(*)::int AS n FROM ${table}`))[0].n);

beforeAll(async () => {
	producer = await signedIn(demo.producer);
	const created = await producer.api('/api/episodes', {
		method: 'POST',
		json: { title: 'Stored input check', slug: SLUG, targetRuntimeSeconds: 600, frameRate: '29.97' }
	});
	expect(created.status).toBe(201);
	episodeId = created.body.episode.id;
	segment = (
		await producer.api(`/api/episodes/${episodeId}/segments`, {
			method: 'POST',
			json: { kind: 'overview', title: 'Intro', plannedSeconds: 60 }
		})
	).body.segment;
	shotId = (
		await producer.api(`/api/segments/${segment.id}/shots`, {
			method: 'POST',
			json: { what: 'Wide of the bay' }
		})
	).body.shot.id;
	const day = await producer.api('/api/shoot-days', {
		method: 'POST',
		json: {
			episodeId,
			shootDate: '2027-04-12',
			locationName: 'Bay 3',
			callTime: '07:30',
			wrapTime: '16:00'
		}
	});
	expect(day.status).toBe(201);
	shootDayId = day.body.shootDay.id;
});

afterAll(async () => {
	await sql(`DELETE FROM shoot_day WHERE id = $1`, [shootDayId]);
	await sql(`DELETE FROM episode WHERE slug = $1`, [SLUG]);
});

describe('a NUL character in a text field', () => {
	const cases: {
		what: string;
		table: string;
		field: string;
		request: () => Promise<{ status: number; body: any }>;
	}[] = [
		{
			what: 'an episode title',
			table: 'episode',
			field: 'title',
			request: () =>
				producer.api('/api/episodes', {
					method: 'POST',
					json: { title: `Bay${NUL} day`, targetRuntimeSeconds: 600, frameRate: '29.97' }
				})
		},
		{
			what: 'a segment title',
			table: 'segment',
			field: 'title',
			request: () =>
				producer.api(`/api/episodes/${episodeId}/segments`, {
					method: 'POST',
					json: { kind: 'overview', title: `Teardown${NUL}`, plannedSeconds: 60 }
				})
		},
		{
			what: 'a shot',
			table: 'shot',
			field: 'what',
			request: () =>
				producer.api(`/api/segments/${segment.id}/shots`, {
					method: 'POST',
					json: { what: `Close-up${NUL}` }
				})
		},
		{
			what: 'a take’s clip name',
			table: 'take',
			field: 'clipName',
			request: () =>
				producer.api(`/api/shots/${shotId}/takes`, {
					method: 'POST',
					json: { clipName: `A001${NUL}C002`, sourceIn: '01:00:00;00', sourceOut: '01:00:10;00' }
				})
		},
		{
			what: 'a chapter title',
			table: 'chapter',
			field: 'title',
			request: () =>
				producer.api(`/api/episodes/${episodeId}/chapters`, {
					method: 'POST',
					json: { start: '0:00', title: `Intro${NUL}` }
				})
		},
		{
			what: 'a shoot day’s location',
			table: 'shoot_day',
			field: 'locationName',
			request: () =>
				producer.api('/api/shoot-days', {
					method: 'POST',
					json: {
						episodeId,
						shootDate: '2027-04-13',
						locationName: `Bay${NUL}3`,
						callTime: '07:30',
						wrapTime: '16:00'
					}
				})
		},
		{
			what: 'a crew member’s name',
			table: 'person',
			field: 'name',
			request: () =>
				producer.api('/api/crew', {
					method: 'POST',
					json: { email: 'nul.name@example.test', name: `Nul${NUL}Name`, roles: ['host'] }
				})
		},
		{
			what: 'a token label',
			table: 'api_token',
			field: 'label',
			request: () =>
				producer.api('/api/tokens', { method: 'POST', json: { label: `laptop${NUL}` } })
		}
	];

	for (const { what, table, field, request } of cases) {
		test(`in ${what} is refused beside the field, and nothing is saved`, async () => {
			const before = await count(table);
			const result = await request();
			expect(result.status).toBe(400);
			expect(result.body.issues[field][0]).toMatch(/invisible control character/);
			expect(await count(table)).toBe(before);
		});
	}

	test('in a form field is refused beside it and the form keeps the rest', async () => {
		const result = await producer.action('/crew?/invite', {
			email: 'nul.form@example.test',
			name: `Nul${NUL}Form`,
			roles: ['host']
		});
		expect(result.status).toBe(400);
		expect(result.data.errors.name[0]).toMatch(/invisible control character/);
		expect(result.data.values.email).toBe('nul.form@example.test');
	});

	test('in a spec card (stored as jsonb, which refuses \\u0000 too) is refused beside the field', async () => {
		const before = await count('spec_card');
		const result = await producer.api(`/api/episodes/${episodeId}/spec-cards`, {
			method: 'POST',
			json: { input: { kind: 'text', heading: `Torque${NUL}`, body: 'Check the maker’s figure.' } }
		});
		expect(result.status).toBe(400);
		expect(JSON.stringify(result.body.issues)).toMatch(/invisible control character/);
		expect(await count('spec_card')).toBe(before);
	});

	test('in an upload’s clip name is refused before any byte is stored', async () => {
		// tus 1.0.0 creation: Upload-Metadata is comma-separated `key base64value` pairs.
		const metadata = Object.entries({
			episodeId,
			filename: 'ACAM_1002.mov',
			filetype: 'video/quicktime',
			clipName: `A001${NUL}C002`
		})
			.map(([key, value]) => `${key} ${Buffer.from(value).toString('base64')}`)
			.join(',');
		const before = await count('upload');
		const result = await producer.request('/api/uploads', {
			method: 'POST',
			headers: { 'tus-resumable': '1.0.0', 'upload-length': '1024', 'upload-metadata': metadata }
		});
		expect(result.status).toBe(400);
		expect(await result.text()).toMatch(/invisible control character/);
		expect(await count('upload')).toBe(before);
	});

	test('in a search or a filter is a 400 about that field, not a 500', async () => {
		const search = await producer.api('/api/parts?q=jack%00stand');
		expect(search.status).toBe(400);
		expect(search.body.issues.q[0]).toMatch(/invisible control character/);
		const footage = await producer.api(`/api/episodes/${episodeId}/footage?camera=A%00cam`);
		expect(footage.status).toBe(400);
		expect(footage.body.issues.camera[0]).toMatch(/invisible control character/);
	});
});

describe('other characters', () => {
	test('a half emoji (a lone UTF-16 surrogate) is refused as a broken character', async () => {
		const result = await producer.api(`/api/segments/${segment.id}/shots`, {
			method: 'POST',
			json: { what: 'Wheel \ud83d' }
		});
		expect(result.status).toBe(400);
		expect(result.body.issues.what[0]).toMatch(/broken character/);
	});

	test('Windows line ends are stored as plain newlines; tabs and newlines stay', async () => {
		const saved = await producer.api(`/api/segments/${segment.id}/script`, {
			method: 'PUT',
			json: {
				body: 'Crack the lugs.\r\nThen lift.\rSupport it.\n\tOn stands.',
				version: segment.script.version
			}
		});
		expect(saved.status).toBe(200);
		const [row] = await sql(`SELECT body FROM segment_script WHERE segment_id = $1`, [segment.id]);
		expect(row.body).toBe('Crack the lugs.\nThen lift.\nSupport it.\n\tOn stands.');
	});
});

describe('a number past a PostgreSQL integer', () => {
	test('as a script version is refused and the script is unchanged', async () => {
		const [before] = await sql(`SELECT body, version FROM segment_script WHERE segment_id = $1`, [
			segment.id
		]);
		const result = await producer.api(`/api/segments/${segment.id}/script`, {
			method: 'PUT',
			json: { body: 'Overwritten?', version: TOO_BIG }
		});
		expect(result.status).toBe(400);
		expect(result.body.issues.version[0]).toMatch(/reload the page/);
		const [after] = await sql(`SELECT body, version FROM segment_script WHERE segment_id = $1`, [
			segment.id
		]);
		expect(after).toEqual(before);
	});

	test('as a pull-list item’s version is refused and the item is unchanged', async () => {
		const [item] = await sql(
			`SELECT id, on_hand, version FROM pull_item WHERE shoot_day_id IN (SELECT id FROM shoot_day WHERE channel_id = ${OWN_CHANNEL}) LIMIT 1`
		);
		const result = await producer.api(`/api/pull-items/${item.id}`, {
			method: 'PATCH',
			json: { onHand: !item.on_hand, version: TOO_BIG }
		});
		expect(result.status).toBe(400);
		expect(result.body.issues.version).toBeDefined();
		const [after] = await sql(`SELECT id, on_hand, version FROM pull_item WHERE id = $1`, [
			item.id
		]);
		expect(after).toEqual(item);
	});

	test('as the channel settings’ version is refused and the settings are unchanged', async () => {
		const { body } = await producer.api('/api/channel');
		const { id: _id, ...settings } = body.channel;
		const result = await producer.api('/api/channel', {
			method: 'PATCH',
			json: { ...settings, name: 'Renamed?', version: TOO_BIG }
		});
		expect(result.status).toBe(400);
		expect(result.body.issues.version).toBeDefined();
		expect((await producer.api('/api/channel')).body.channel).toEqual(body.channel);
	});

	test('as a part’s version is refused and the part is unchanged', async () => {
		const [part] = await sql(
			`SELECT id, name, version FROM part WHERE channel_id = ${OWN_CHANNEL} LIMIT 1`
		);
		const result = await producer.api(`/api/parts/${part.id}`, {
			method: 'PATCH',
			json: { version: TOO_BIG, name: 'Renamed?' }
		});
		expect(result.status).toBe(400);
		expect(result.body.issues.version).toBeDefined();
		expect((await sql(`SELECT id, name, version FROM part WHERE id = $1`, [part.id]))[0]).toEqual(
			part
		);
	});

	test('as the cut’s expected length is refused and the cut is unchanged', async () => {
		const result = await producer.api(`/api/episodes/${episodeId}/cut`, {
			method: 'PATCH',
			json: { duration: '12:00', expectedFrames: TOO_BIG }
		});
		expect(result.status).toBe(400);
		expect(result.body.issues.expectedFrames).toBeDefined();
		const [row] = await sql(`SELECT cut_duration_frames FROM episode WHERE id = $1`, [episodeId]);
		expect(row.cut_duration_frames).toBeNull();
	});

	test('as a typed time that counts more frames than any cut is refused beside the field', async () => {
		// 999,999 hours at 30000/1001 fps is about 1.08·10^11 frames: far past 2^31.
		const result = await producer.api(`/api/episodes/${episodeId}/cut`, {
			method: 'PATCH',
			json: { duration: '999999:00:00' }
		});
		expect(result.status).toBe(400);
		expect(result.body.issues.duration[0]).toMatch(/far too long/);
	});

	test('as a version in a query string is refused', async () => {
		const [chapter] = await sql(
			`SELECT c.id, c.episode_id FROM chapter c JOIN episode e ON e.id = c.episode_id WHERE e.channel_id = ${OWN_CHANNEL} LIMIT 1`
		);
		const before = await count('chapter');
		const result = await producer.api(
			`/api/episodes/${chapter.episode_id}/chapters/${chapter.id}?version=${TOO_BIG}`,
			{ method: 'DELETE' }
		);
		expect(result.status).toBe(400);
		expect(await count('chapter')).toBe(before);
	});
});

describe('a day that is not on the calendar', () => {
	const shootDay = (shootDate: string) => ({
		episodeId,
		shootDate,
		locationName: 'Bay 3',
		callTime: '07:30',
		wrapTime: '16:00'
	});

	test('as a new shoot day’s date is refused in words', async () => {
		const before = await count('shoot_day');
		// February 2027 has 28 days: 2027 is not a leap year (Date.UTC(2027, 1, 29) rolls over to 1 March).
		const february = await producer.api('/api/shoot-days', {
			method: 'POST',
			json: shootDay('2027-02-31')
		});
		expect(february.status).toBe(400);
		expect(february.body.issues.shootDate[0]).toMatch(/February 2027 has 28 days/);
		// There is no year 0 in the Gregorian calendar (PostgreSQL answers "date/time field value out of range").
		const yearZero = await producer.api('/api/shoot-days', {
			method: 'POST',
			json: shootDay('0000-01-01')
		});
		expect(yearZero.status).toBe(400);
		expect(yearZero.body.issues.shootDate[0]).toMatch(/between 1900 and 2200/);
		expect(await count('shoot_day')).toBe(before);
	});

	test('29 February is accepted in a leap year', async () => {
		// 2028 is a leap year (divisible by 4, not a century): Date.UTC(2028, 1, 29) stays in February.
		const [row] = await sql(`SELECT version FROM shoot_day WHERE id = $1`, [shootDayId]);
		const { episodeId: _episode, ...fields } = shootDay('2028-02-29');
		const result = await producer.api(`/api/shoot-days/${shootDayId}`, {
			method: 'PATCH',
			json: { ...fields, locationAddress: '', bay: '', notes: '', version: row.version }
		});
		expect(result.status).toBe(200);
		const [after] = await sql(`SELECT shoot_date::text AS day FROM shoot_day WHERE id = $1`, [
			shootDayId
		]);
		expect(after.day).toBe('2028-02-29');
	});

	test('as a changed shoot day’s date is refused and the day is unchanged', async () => {
		const [before] = await sql(
			`SELECT shoot_date::text AS day, version FROM shoot_day WHERE id = $1`,
			[shootDayId]
		);
		const { episodeId: _episode, ...fields } = shootDay('2027-04-31');
		const result = await producer.api(`/api/shoot-days/${shootDayId}`, {
			method: 'PATCH',
			json: { ...fields, locationAddress: '', bay: '', notes: '', version: before.version }
		});
		expect(result.status).toBe(400);
		expect(result.body.issues.shootDate[0]).toMatch(/April 2027 has 30 days/);
		const [after] = await sql(
			`SELECT shoot_date::text AS day, version FROM shoot_day WHERE id = $1`,
			[shootDayId]
		);
		expect(after).toEqual(before);
	});

	test('as a publish date is refused beside the field', async () => {
		const before = await count('episode');
		const result = await producer.api('/api/episodes', {
			method: 'POST',
			json: {
				title: 'Impossible date',
				targetRuntimeSeconds: 600,
				frameRate: '29.97',
				publishDate: '2027-02-31'
			}
		});
		expect(result.status).toBe(400);
		expect(result.body.issues.publishDate[0]).toMatch(/February 2027 has 28 days/);
		expect(await count('episode')).toBe(before);
	});

	test('in the episode list’s filters is a 400 from the API and a note on the page', async () => {
		const from = await producer.api('/api/episodes?from=2027-02-31');
		expect(from.status).toBe(400);
		expect(from.body.issues.from[0]).toMatch(/February 2027 has 28 days/);
		const to = await producer.api('/api/episodes?to=0000-01-01');
		expect(to.status).toBe(400);
		expect(to.body.issues.to[0]).toMatch(/between 1900 and 2200/);
		const page = await producer.request('/episodes?from=2027-02-31');
		expect(page.status).toBe(200);
		expect(await page.text()).toMatch(/February 2027 has 28 days/);
	});
});

describe('the shared checks agree with PostgreSQL itself', () => {
	/** What the database makes of a value: the text it gives back, or null when it refuses it. */
	const stored = async (value: unknown, type: string): Promise<string | null> => {
		try {
			const [row] = await sql(`SELECT ($1::${type})::text AS back`, [value]);
			return row.back;
		} catch {
			return null;
		}
	};

	test('every character PostgreSQL refuses or changes in text is refused beside the field', async () => {
		const codes = [
			...Array.from({ length: 0xa0 }, (_, code) => code),
			0xd800,
			0xdbff,
			0xdc00,
			0xdfff,
			0x200f,
			0x202e,
			0xfeff
		];
		const refused: number[] = [];
		const changed: number[] = [];
		for (const code of codes) {
			const value = `a${String.fromCharCode(code)}b`;
			const back = await stored(value, 'text');
			if (back === null) refused.push(code);
			else if (back !== value) changed.push(code);
			if (back !== value) expect(textProblem(value), `U+${code.toString(16)}`).not.toBeNull();
		}
		// Only NUL is refused; half surrogates come back as U+FFFD (the driver writes UTF-8).
		expect(refused).toEqual([0]);
		expect(changed).toEqual([0xd800, 0xdbff, 0xdc00, 0xdfff]);
	});

	test('a whole number is accepted exactly when an integer column holds it', async () => {
		const field = wholeNumber({ error: 'A number.' });
		for (const value of [INT_MIN - 1, INT_MIN, -1, 0, INT_MAX, INT_MAX + 1, 2 ** 32]) {
			const back = await stored(value, 'integer');
			expect(field.safeParse(value).success, String(value)).toBe(back === String(value));
		}
	});

	test('a date is accepted exactly when PostgreSQL’s date type reads it back as typed', async () => {
		const pad = (value: number, width: number) => String(value).padStart(width, '0');
		for (const year of [DATE_YEARS.min, 2000, 2027, 2028, 2100, DATE_YEARS.max])
			for (const month of [0, 1, 2, 4, 12, 13])
				for (const day of [0, 1, 28, 29, 30, 31, 32]) {
					const typed = `${pad(year, 4)}-${pad(month, 2)}-${pad(day, 2)}`;
					const back = await stored(typed, 'date');
					expect(dateProblem(typed) === null, typed).toBe(back === typed);
				}
		// Year 0 does not exist: PostgreSQL refuses it, and so does the check (with the range in words).
		expect(await stored('0000-01-01', 'date')).toBeNull();
		expect(dateProblem('0000-01-01')).toMatch(/between 1900 and 2200/);
	});
});
