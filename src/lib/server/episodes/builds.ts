/**
 * Builds: the channel's project vehicles and their build sheets. The sheet's numbers come from the
 * spec modules (tyre geometry from parseTyreSize, lift notes from liftSummary), never typed by hand.
 */
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import type { Executor } from './episodes';
import type { BuildInput } from '$lib/schemas/episodes';
import {
	isSpecError,
	liftSummary,
	parseTyreSize,
	TYRE_GEOMETRY_NOTE,
	type LiftMethod,
	type LiftSummary,
	type SuspensionType,
	type TyreSize
} from '$lib/specs';

export const buildNotFound = () => notFound('That build');

const buildColumns = [
	'build.id',
	'build.name',
	'build.year',
	'build.vehicleType',
	'build.drivetrain',
	'build.frontSuspension',
	'build.rearSuspension',
	'build.frontSpring',
	'build.rearSpring',
	'build.frontLiftIn',
	'build.rearLiftIn',
	'build.frontLiftMethod',
	'build.rearLiftMethod',
	'build.tyreSize',
	'build.notes',
	'build.version'
] as const;

/** Every build of the channel with how many episodes featured it. */
export async function listBuilds(channelId: string) {
	const rows = await db
		.selectFrom('build')
		.select(buildColumns)
		.select((eb) =>
			eb
				.selectFrom('episodeBuild')
				.select((inner) => inner.fn.countAll<number>().as('n'))
				.whereRef('episodeBuild.buildId', '=', 'build.id')
				.as('episodeCount')
		)
		.where('build.channelId', '=', channelId)
		.orderBy('build.name')
		.execute();
	return rows.map((row) => ({
		...row,
		episodeCount: Number(row.episodeCount ?? 0),
		tyre: tyreFacts(row.tyreSize)
	}));
}

function tyreFacts(size: string): { size: TyreSize | null; problem: string | null } {
	try {
		return { size: parseTyreSize(size), problem: null };
	} catch (failure) {
		if (isSpecError(failure)) return { size: null, problem: failure.message };
		throw failure;
	}
}

type BuildRow = {
	frontLiftIn: number;
	rearLiftIn: number;
	frontSpring: SuspensionType | null;
	rearSpring: SuspensionType | null;
	frontLiftMethod: string | null;
	rearLiftMethod: string | null;
};

/** The lift notes of a build, or why they can't be worked out yet (in words for the sheet). */
function liftFacts(build: BuildRow): { summary: LiftSummary | null; problem: string | null } {
	if (build.frontLiftIn === 0 && build.rearLiftIn === 0)
		return { summary: null, problem: 'No lift: stock ride height.' };
	if (!build.frontSpring || !build.rearSpring)
		return { summary: null, problem: 'Set the spring type of each axle to see the lift notes.' };
	try {
		const summary = liftSummary({
			frontLiftIn: build.frontLiftIn,
			rearLiftIn: build.rearLiftIn,
			frontSuspension: build.frontSpring,
			rearSuspension: build.rearSpring,
			method: {
				front: build.frontLiftMethod as LiftMethod | null,
				rear: build.rearLiftMethod as LiftMethod | null
			}
		});
		return { summary, problem: null };
	} catch (failure) {
		if (isSpecError(failure)) return { summary: null, problem: failure.message };
		throw failure;
	}
}

/** A build's sheet: its facts, computed tyre and lift figures, and the episodes it appeared in. */
export async function buildSheet(channelId: string, buildId: string, executor: Executor = db) {
	if (!isUuid(buildId)) throw buildNotFound();
	const build = await executor
		.selectFrom('build')
		.select(buildColumns)
		.where('build.id', '=', buildId)
		.where('build.channelId', '=', channelId)
		.executeTakeFirst();
	if (!build) throw buildNotFound();
	const episodes = await executor
		.selectFrom('episodeBuild')
		.innerJoin('episode', 'episode.id', 'episodeBuild.episodeId')
		.select(['episode.id', 'episode.title', 'episode.stage', 'episode.publishDate'])
		.where('episodeBuild.buildId', '=', buildId)
		.where('episode.channelId', '=', channelId)
		.orderBy('episode.publishDate', (order) => order.desc().nullsFirst())
		.execute();
	return {
		build,
		tyre: tyreFacts(build.tyreSize),
		tyreNote: TYRE_GEOMETRY_NOTE,
		lift: liftFacts(build),
		episodes
	};
}

export type BuildSheet = Awaited<ReturnType<typeof buildSheet>>;

function values(input: BuildInput) {
	return {
		name: input.name,
		year: input.year,
		vehicleType: input.vehicleType,
		drivetrain: input.drivetrain,
		frontSuspension: input.frontSuspension,
		rearSuspension: input.rearSuspension,
		frontSpring: input.frontSpring ?? null,
		rearSpring: input.rearSpring ?? null,
		frontLiftIn: input.frontLiftIn,
		rearLiftIn: input.rearLiftIn,
		frontLiftMethod: input.frontLiftIn > 0 ? (input.frontLiftMethod ?? null) : null,
		rearLiftMethod: input.rearLiftIn > 0 ? (input.rearLiftMethod ?? null) : null,
		tyreSize: parseTyreSize(input.tyreSize).code,
		notes: input.notes
	};
}

export async function createBuild(channelId: string, input: BuildInput) {
	const row = await db
		.insertInto('build')
		.values({ channelId, ...values(input) })
		.returning('id')
		.executeTakeFirstOrThrow();
	return buildSheet(channelId, row.id);
}

/** Saves a build; a stale version answers 409 with the saved sheet in `current`. */
export async function updateBuild(channelId: string, buildId: string, input: BuildInput) {
	if (!isUuid(buildId)) throw buildNotFound();
	if (input.version === undefined)
		throw new DomainError(400, 'The version is missing: reload the page.', {
			version: ['Missing.']
		});
	const updated = await db
		.updateTable('build')
		.set((eb) => ({ ...values(input), version: eb('version', '+', 1) }))
		.where('id', '=', buildId)
		.where('channelId', '=', channelId)
		.where('version', '=', input.version)
		.returning('id')
		.executeTakeFirst();
	if (!updated) {
		const current = await buildSheet(channelId, buildId);
		throw new DomainError(
			409,
			'Someone saved this build while you were editing. Their version is shown; your changes are still in the form.',
			undefined,
			{ current: current.build }
		);
	}
	return buildSheet(channelId, buildId);
}
