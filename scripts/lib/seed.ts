/** Writes the demo world into an empty database, in one transaction. */
import { CamelCasePlugin, Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import { hash } from '@node-rs/argon2';
import type { Database } from '../../src/lib/server/db/types.ts';
import { DEMO_PASSWORD, demoBuilds, demoChannels, demoEpisodes, demoParts } from './demo-data.ts';
import type { SeedContext } from './seed-context.ts';
import { seedEpisodeWork } from './seed-episode-work.ts';
import { seedEdit } from './seed-edit.ts';
import { seedShoot } from './seed-shoot.ts';
import { seedParts } from './seed-parts.ts';
import { seedSpecCards } from './seed-spec-cards.ts';

export async function seedDemo(databaseUrl: string): Promise<'seeded' | 'skipped'> {
	const db = new Kysely<Database>({
		dialect: new PostgresDialect({ pool: new pg.Pool({ connectionString: databaseUrl, max: 2 }) }),
		plugins: [new CamelCasePlugin()]
	});
	try {
		const existing = await db.selectFrom('channel').select('id').limit(1).executeTakeFirst();
		if (existing) return 'skipped';
		const passwordHash = await hash(DEMO_PASSWORD);
		await db.transaction().execute(async (trx) => {
			const context: SeedContext = {
				channels: new Map(),
				people: new Map(),
				builds: new Map(),
				episodes: new Map()
			};
			const people = context.people;
			for (const spec of demoChannels) {
				const channel = await trx
					.insertInto('channel')
					.values({
						name: spec.name,
						frameRate: spec.frameRate,
						callToAction: spec.callToAction,
						contact: spec.contact,
						disclosure: spec.disclosure
					})
					.returning('id')
					.executeTakeFirstOrThrow();
				context.channels.set(spec.key, channel.id);
				const crewByRole = new Map<string, string>();
				for (const member of spec.crew) {
					let personId = people.get(member.email);
					if (!personId) {
						personId = (
							await trx
								.insertInto('person')
								.values({ email: member.email, name: member.name, passwordHash })
								.returning('id')
								.executeTakeFirstOrThrow()
						).id;
						people.set(member.email, personId);
					}
					await trx
						.insertInto('membership')
						.values({ channelId: channel.id, personId, roles: [...member.roles] })
						.execute();
					for (const role of member.roles) crewByRole.set(role, personId);
				}
				const builds = context.builds;
				for (const { key, ...build } of demoBuilds[spec.key]) {
					builds.set(
						key,
						(
							await trx
								.insertInto('build')
								.values({ ...build, channelId: channel.id })
								.returning('id')
								.executeTakeFirstOrThrow()
						).id
					);
				}
				if (spec.key === 'torquehaven') {
					await trx
						.insertInto('part')
						.values(
							demoParts.map(([sku, name, category, brand, price, fitmentNote, status]) => ({
								channelId: channel.id,
								sku,
								name,
								category,
								brand,
								priceCents: Math.round(price * 100),
								currency: 'USD',
								storeUrl: `https://shop.torquehaven.test/p/${sku.toLowerCase()}?ref=catalogue`,
								fitmentNote,
								status: status ?? 'active'
							}))
						)
						.execute();
				}
				for (const episode of demoEpisodes[spec.key]) {
					const publishDate = new Date(Date.now() + episode.publishDaysFromNow * 86400_000)
						.toISOString()
						.slice(0, 10);
					const row = await trx
						.insertInto('episode')
						.values({
							channelId: channel.id,
							title: episode.title,
							slug: episode.slug,
							logline: episode.logline,
							targetRuntimeSeconds: episode.targetRuntimeSeconds,
							frameRate: spec.frameRate,
							publishDate,
							stage: episode.stage
						})
						.returning('id')
						.executeTakeFirstOrThrow();
					context.episodes.set(episode.slug, {
						id: row.id,
						channelId: channel.id,
						frameRate: spec.frameRate,
						stage: episode.stage
					});
					for (const buildKey of episode.builds)
						await trx
							.insertInto('episodeBuild')
							.values({ episodeId: row.id, buildId: builds.get(buildKey)! })
							.execute();
					for (const [role, personId] of crewByRole) {
						if (role === 'producer') continue;
						await trx
							.insertInto('episodeAssignment')
							.values({ episodeId: row.id, role: role as never, personId })
							.execute();
					}
				}
			}
			await seedEpisodeWork(trx, context);
			await seedEdit(trx, context);
			await seedShoot(trx, context);
			await seedParts(trx, context);
			await seedSpecCards(trx, context);
		});
		return 'seeded';
	} finally {
		await db.destroy();
	}
}
