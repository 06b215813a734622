/**
 * Shoot days over HTTP: planning a day, who may change what, the pull list ticked by the merch
 * team, stale saves, and the call sheet carrying the day's cautions. Storage arithmetic is checked
 * in tests/unit (decimal GB = Mbit/s × s ÷ 8 ÷ 1000).
 */
import { beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

let camera: Visitor;
let merch: Visitor;
let host: Visitor;
let episodeId = '';
let dayId = '';

beforeAll(async () => {
	[camera, merch, host] = await Promise.all([
		signedIn(demo.camera),
		signedIn(demo.merch),
		signedIn(demo.host)
	]);
	const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-285-tyres'`);
	episodeId = episode.id;
});

describe('planning a shoot day', () => {
	test('the camera operator creates a day; it films the episode’s segments that need footage and its builds', async () => {
		const result = await camera.action('/shoots?/create', {
			episodeId,
			shootDate: '2027-01-14',
			locationName: 'Torquehaven Supply workshop',
			bay: 'Bay 2',
			callTime: '07:00',
			wrapTime: '15:30'
		});
		expect(result.type).toBe('redirect');
		dayId = result.location!.split('/').pop()!;
		const filmed = await sql(
			`SELECT count(*)::int AS n FROM shoot_day_segment WHERE shoot_day_id = $1`,
			[dayId]
		);
		const needing = await sql(
			`SELECT count(*)::int AS n FROM segment WHERE episode_id = $1 AND needs_footage`,
			[episodeId]
		);
		expect(filmed[0].n).toBe(needing[0].n);
		const builds = await sql(
			`SELECT count(*)::int AS n FROM shoot_day_build WHERE shoot_day_id = $1`,
			[dayId]
		);
		expect(builds[0].n).toBeGreaterThan(0);
	});

	test('a wrap before the call is refused field by field and nothing is created', async () => {
		const before = await sql(`SELECT count(*)::int AS n FROM shoot_day`);
		const result = await camera.action('/shoots?/create', {
			episodeId,
			shootDate: '2027-01-15',
			locationName: 'Bay',
			callTime: '15:00',
			wrapTime: '09:00'
		});
		expect(result.status).toBe(400);
		expect(result.data.errors.wrapTime[0]).toMatch(/Make the wrap later than the call time/);
		expect(result.data.values.locationName).toBe('Bay');
		expect((await sql(`SELECT count(*)::int AS n FROM shoot_day`))[0].n).toBe(before[0].n);
	});

	test('with no episode picked, every problem shows at once in plain words', async () => {
		const result = await camera.action('/shoots?/create', {
			shootDate: '2027-01-15',
			locationName: '',
			callTime: '15:00',
			wrapTime: '09:00'
		});
		expect(result.status).toBe(400);
		expect(result.data.errors.episodeId).toEqual(['Pick an episode.']);
		expect(result.data.errors.locationName[0]).toMatch(/Name the shop/);
		// The wrap is checked in the same pass, not only once the rest is right.
		expect(result.data.errors.wrapTime[0]).toMatch(/Make the wrap later/);
		expect(JSON.stringify(result.data.errors)).not.toMatch(/Invalid input|expected string/);
	});

	test('the host may read a shoot day but not change it', async () => {
		expect((await host.api(`/api/shoot-days/${dayId}`)).status).toBe(200);
		const refused = await host.action(`/shoots/${dayId}?/addGear`, {
			kind: 'audio',
			label: 'Boom',
			quantity: '1'
		});
		expect(refused.status).toBe(403);
	});

	test('cameras take a recording profile of this channel; crew called must be on the crew', async () => {
		const [profile] = await sql(`SELECT id FROM recording_profile ORDER BY name LIMIT 1`);
		expect(
			(
				await camera.action(`/shoots/${dayId}?/addCamera`, {
					label: 'A cam',
					profileId: profile.id,
					rollHours: ''
				})
			).type
		).toBe('success');
		const [outsider] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.otherProducer]);
		const wrongCrew = await camera.action(`/shoots/${dayId}?/members`, {
			list: 'crew',
			ids: [outsider.id]
		});
		expect(wrongCrew.status).toBe(400);
		const [mika] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.camera]);
		expect(
			(await camera.action(`/shoots/${dayId}?/members`, { list: 'crew', ids: [mika.id] })).type
		).toBe('success');
	});

	test('a stale save of the day answers 409 and keeps the newer one', async () => {
		const { body } = await camera.api(`/api/shoot-days/${dayId}`);
		const base = {
			shootDate: body.day.shootDate,
			locationName: body.day.locationName,
			locationAddress: '',
			bay: 'Bay 2',
			bayFrom: '',
			bayUntil: '',
			callTime: '07:00',
			wrapTime: '15:30',
			notes: '',
			version: body.day.version
		};
		expect(
			(
				await camera.api(`/api/shoot-days/${dayId}`, {
					method: 'PATCH',
					json: { ...base, notes: 'first' }
				})
			).status
		).toBe(200);
		const stale = await camera.api(`/api/shoot-days/${dayId}`, {
			method: 'PATCH',
			json: { ...base, notes: 'second' }
		});
		expect(stale.status).toBe(409);
		expect(stale.body.current.notes).toBe('first');
	});
});

describe('the pull list', () => {
	test('camera adds a catalogue part and an extra; merch ticks them on hand; the host may not', async () => {
		const [part] = await sql(`SELECT id FROM part WHERE sku = 'CT-AT-2857017'`);
		expect(
			(
				await camera.action(`/shoots/${dayId}?/addPull`, {
					partId: part.id,
					label: '',
					quantity: '4'
				})
			).type
		).toBe('success');
		expect(
			(
				await camera.action(`/shoots/${dayId}?/addPull`, {
					partId: '',
					label: 'Valve stems',
					quantity: '4'
				})
			).type
		).toBe('success');
		const empty = await camera.action(`/shoots/${dayId}?/addPull`, {
			partId: '',
			label: '',
			quantity: '1'
		});
		expect(empty.status).toBe(400);
		expect(empty.data.errors.label[0]).toMatch(/Pick a part/);

		const items = await sql(
			`SELECT id, version, label FROM pull_item WHERE shoot_day_id = $1 ORDER BY label`,
			[dayId]
		);
		expect(items.map((i) => i.label)).toEqual(['Trailgrip A/T 285/70R17 121/118S', 'Valve stems']);
		expect(
			(
				await host.api(`/api/pull-items/${items[0].id}`, {
					method: 'PATCH',
					json: { onHand: true, version: items[0].version }
				})
			).status
		).toBe(403);
		expect(
			(
				await camera.api(`/api/pull-items/${items[0].id}`, {
					method: 'PATCH',
					json: { onHand: true, version: items[0].version }
				})
			).status
		).toBe(403);
		const ticked = await merch.api(`/api/pull-items/${items[0].id}`, {
			method: 'PATCH',
			json: { onHand: true, version: items[0].version }
		});
		expect(ticked.status).toBe(200);
		const [row] = await sql(`SELECT on_hand, checked_by FROM pull_item WHERE id = $1`, [
			items[0].id
		]);
		const [priya] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.merch]);
		expect(row).toEqual({ on_hand: true, checked_by: priya.id });
		const stale = await merch.api(`/api/pull-items/${items[0].id}`, {
			method: 'PATCH',
			json: { onHand: false, version: items[0].version }
		});
		expect(stale.status).toBe(409);
	});
});

describe('the call sheet', () => {
	test('lists the cautions of the day’s hazardous segments and defers to licensed practice', async () => {
		const [day] = await sql(
			`SELECT sd.id FROM shoot_day sd JOIN episode e ON e.id = sd.episode_id WHERE e.slug = 'mule-rear-block-lift' LIMIT 1`
		);
		const cautions = await sql(
			`SELECT c.text FROM caution c JOIN shoot_day_segment s ON s.segment_id = c.segment_id WHERE s.shoot_day_id = $1`,
			[day.id]
		);
		expect(cautions.length).toBeGreaterThan(0);
		const page = await camera.request(`/shoots/${day.id}/call-sheet`);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('Cautions for today’s work');
		for (const caution of cautions)
			expect(html).toContain(
				caution.text
					.replace(/&/g, '&amp;')
					.replace(/"/g, '&quot;')
					.replace(/'/g, '&#39;')
					.slice(0, 40)
			);
		expect(html).toMatch(/licensed professional/i);
	});

	test('a new day’s call sheet names the episode’s assigned crew and says where to add cameras', async () => {
		const created = await camera.action('/shoots?/create', {
			episodeId,
			shootDate: '2027-03-03',
			locationName: 'Torquehaven Supply workshop',
			callTime: '07:00',
			wrapTime: '15:00'
		});
		const newDay = created.location!.split('/').pop()!;
		const assigned = await sql(
			`SELECT p.name FROM episode_assignment a JOIN person p ON p.id = a.person_id WHERE a.episode_id = $1`,
			[episodeId]
		);
		expect(assigned.length).toBeGreaterThan(1);
		const html = await (await camera.request(`/shoots/${newDay}/call-sheet`)).text();
		const crew = html.slice(html.indexOf('Crew called'), html.indexOf('>Filming<'));
		for (const person of assigned) expect(crew).toContain(person.name);
		expect(crew).not.toMatch(/<li>\s*—\s*<\/li>/);
		const cameras = html.slice(html.indexOf('Cameras and cards'), html.indexOf('>Gear<'));
		expect(cameras).toContain(`href="/shoots/${newDay}#cams-heading"`);
		expect(cameras).toMatch(/No cameras yet/);
	});

	test('another channel’s producer gets 404 for this shoot day', async () => {
		const other = await signedIn(demo.otherProducer);
		expect((await other.api(`/api/shoot-days/${dayId}`)).status).toBe(404);
		expect((await other.request(`/shoots/${dayId}`)).status).toBe(404);
	});
});

describe('pull list from the segments', () => {
	test('adds every part linked on the filmed segments’ notes and every SKU named in their scripts, once', async () => {
		const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`);
		const created = await camera.action('/shoots?/create', {
			episodeId: episode.id,
			shootDate: '2027-02-02',
			locationName: 'Torquehaven Supply workshop',
			callTime: '07:00',
			wrapTime: '15:00'
		});
		const newDay = created.location!.split('/').pop()!;
		const expected = await sql(
			`SELECT DISTINCT p.id FROM part p WHERE p.id IN (
			   SELECT np.part_id FROM segment_note_part np JOIN segment_note n ON n.id = np.note_id JOIN shoot_day_segment s ON s.segment_id = n.segment_id WHERE s.shoot_day_id = $1)
			 OR EXISTS (SELECT 1 FROM segment_script sc JOIN shoot_day_segment s ON s.segment_id = sc.segment_id WHERE s.shoot_day_id = $1 AND position(p.sku IN sc.body) > 0)`,
			[newDay]
		);
		expect(expected.length).toBeGreaterThan(0);
		const first = await merch.action(`/shoots/${newDay}?/pullFromSegments`, {});
		expect(first.data.added).toBe(expected.length);
		const items = await sql(`SELECT part_id, source FROM pull_item WHERE shoot_day_id = $1`, [
			newDay
		]);
		expect(items.map((i) => i.part_id).sort()).toEqual(expected.map((p) => p.id).sort());
		expect(items.every((i) => i.source === 'segment')).toBe(true);
		const again = await merch.action(`/shoots/${newDay}?/pullFromSegments`, {});
		expect(again.data.added).toBe(0);
		expect((await host.action(`/shoots/${newDay}?/pullFromSegments`, {})).status).toBe(403);
	});
});
