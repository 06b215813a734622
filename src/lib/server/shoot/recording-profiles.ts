/** The channel's recording profiles: camera, codec, resolution, rate and bitrate a camera on a shoot day records with. */
import type { z } from 'zod';
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import type { profileSchema } from '$lib/schemas/shoot';

export async function listProfiles(channelId: string) {
	return db
		.selectFrom('recordingProfile')
		.selectAll()
		.where('channelId', '=', channelId)
		.orderBy('name')
		.execute();
}

export async function createProfile(channelId: string, input: z.infer<typeof profileSchema>) {
	return db
		.insertInto('recordingProfile')
		.values({ channelId, ...input })
		.returningAll()
		.executeTakeFirstOrThrow();
}

export async function deleteProfile(channelId: string, profileId: string) {
	if (!isUuid(profileId)) throw notFound('That recording profile');
	const profile = await db
		.selectFrom('recordingProfile')
		.select('id')
		.where('id', '=', profileId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!profile) throw notFound('That recording profile');
	const inUse = await db
		.selectFrom('shootDayCamera')
		.select('id')
		.where('profileId', '=', profileId)
		.executeTakeFirst();
	if (inUse) throw new DomainError(409, 'A shoot day uses this profile: change that camera first.');
	const result = await db
		.deleteFrom('recordingProfile')
		.where('id', '=', profileId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (Number(result.numDeletedRows) === 0) throw notFound('That recording profile');
}
