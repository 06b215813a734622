/** Demo shoot days: fictional recording profiles, cameras, gear, crew called and pull lists. */
import type { Transaction } from 'kysely';
import type { Database } from '../../src/lib/server/db/types.ts';
import type { SeedContext } from './seed-context.ts';

const profiles = [
	{
		key: 'a',
		name: 'A cam, install wide',
		camera: 'Lumenjack L4 cinema body',
		codec: 'H.265 10-bit 4:2:2',
		resolution: '3840×2160',
		bitrateMbps: 150
	},
	{
		key: 'b',
		name: 'B cam, detail close-ups',
		camera: 'Gullcam G2 compact',
		codec: 'H.264 8-bit 4:2:0',
		resolution: '3840×2160',
		bitrateMbps: 100
	},
	{
		key: 'g',
		name: 'Gimbal walk-around',
		camera: 'Gullcam G2 compact',
		codec: 'H.264 8-bit 4:2:0',
		resolution: '1920×1080',
		bitrateMbps: 50
	}
] as const;

const days = [
	{
		slug: 'mule-rear-block-lift',
		offsetDays: -6,
		bay: 'Bay 3 (two-post lift)',
		call: '07:30',
		wrap: '16:30',
		from: '07:00',
		until: '17:00',
		cameras: [
			['A cam', 'a'],
			['B cam', 'b']
		],
		pull: [
			['KBS-LB-300T', 1],
			['KBS-UB-58-11', 1],
			['QS-MT-230R', 2],
			['NB-BL-REAR', 1],
			['KBS-BS-6T', 1],
			['KBS-TW-250', 1]
		],
		extras: [
			['Brake cleaner, 2 cans', 1],
			['Thread locker, medium strength', 1]
		],
		onHand: true
	},
	{
		slug: 'mule-285-tyres',
		offsetDays: 8,
		bay: 'Bay 1 (tyre machine)',
		call: '08:00',
		wrap: '14:00',
		from: '07:30',
		until: '14:30',
		cameras: [
			['A cam', 'a'],
			['Gimbal', 'g']
		],
		pull: [
			['CT-AT-2857017', 4],
			['HW-RK17-85', 4],
			['HW-LN-1420', 1]
		],
		extras: [
			['Valve stems, 4', 1],
			['Wheel weights', 1]
		],
		onHand: false
	}
] as const;

export async function seedShoot(trx: Transaction<Database>, context: SeedContext): Promise<void> {
	const channelId = context.channels.get('torquehaven')!;
	const profileIds = new Map<string, string>();
	for (const { key, ...profile } of profiles) {
		profileIds.set(
			key,
			(
				await trx
					.insertInto('recordingProfile')
					.values({ ...profile, channelId, frameRate: '29.97' })
					.returning('id')
					.executeTakeFirstOrThrow()
			).id
		);
	}
	const crew = ['rico@torquehaven.test', 'mika@torquehaven.test', 'priya@torquehaven.test'].map(
		(email) => context.people.get(email)!
	);
	const merch = context.people.get('priya@torquehaven.test')!;
	for (const spec of days) {
		const episode = context.episodes.get(spec.slug)!;
		const shootDate = new Date(Date.now() + spec.offsetDays * 86_400_000)
			.toISOString()
			.slice(0, 10);
		const day = await trx
			.insertInto('shootDay')
			.values({
				channelId,
				episodeId: episode.id,
				shootDate,
				locationName: 'Torquehaven Supply workshop',
				locationAddress: 'Unit 4, Millbrook Works (fictional demo address)',
				bay: spec.bay,
				bayFrom: spec.from,
				bayUntil: spec.until,
				callTime: spec.call,
				wrapTime: spec.wrap,
				programMinutes: 12,
				shootingRatio: 8,
				cardSizeGb: 256,
				uplinkMbps: 200,
				notes:
					'Lift inspected the morning of the shoot. Nobody under the vehicle until it sits on stands.'
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await trx
			.insertInto('shootDayCrew')
			.values(crew.map((personId) => ({ shootDayId: day.id, personId })))
			.execute();
		const builds = await trx
			.selectFrom('episodeBuild')
			.select('buildId')
			.where('episodeId', '=', episode.id)
			.execute();
		if (builds.length)
			await trx
				.insertInto('shootDayBuild')
				.values(builds.map((b) => ({ shootDayId: day.id, buildId: b.buildId })))
				.execute();
		const segments = await trx
			.selectFrom('segment')
			.select('id')
			.where('episodeId', '=', episode.id)
			.where('needsFootage', '=', true)
			.execute();
		if (segments.length)
			await trx
				.insertInto('shootDaySegment')
				.values(segments.map((s) => ({ shootDayId: day.id, segmentId: s.id })))
				.execute();
		for (const [label, profile] of spec.cameras)
			await trx
				.insertInto('shootDayCamera')
				.values({ shootDayId: day.id, label, profileId: profileIds.get(profile)!, rollHours: null })
				.execute();
		await trx
			.insertInto('gearItem')
			.values([
				{ shootDayId: day.id, kind: 'audio', label: 'Wireless lavalier kit', quantity: 2 },
				{ shootDayId: day.id, kind: 'light', label: 'LED panel, 1×1', quantity: 2 },
				{ shootDayId: day.id, kind: 'grip', label: 'Magic arm with clamp', quantity: 3 }
			])
			.execute();
		for (const [sku, quantity] of spec.pull) {
			const part = await trx
				.selectFrom('part')
				.select(['id', 'name'])
				.where('channelId', '=', channelId)
				.where('sku', '=', sku)
				.executeTakeFirstOrThrow();
			await trx
				.insertInto('pullItem')
				.values({
					shootDayId: day.id,
					partId: part.id,
					label: part.name,
					quantity,
					source: 'segment',
					onHand: spec.onHand,
					checkedBy: spec.onHand ? merch : null,
					checkedAt: spec.onHand ? new Date() : null
				})
				.execute();
		}
		for (const [label, quantity] of spec.extras)
			await trx
				.insertInto('pullItem')
				.values({ shootDayId: day.id, label, quantity, source: 'extra', onHand: spec.onHand })
				.execute();
	}
}
