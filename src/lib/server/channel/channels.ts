/** Channel settings: the producer's to edit, with a version so two producers never overwrite each other. */
import { db } from '../db';
import { DomainError } from '../http/api';
import type { z } from 'zod';
import type { channelSettingsSchema } from '$lib/schemas/people';

/** The channel's settings as the channel page shows and saves them. */
const SETTINGS_COLUMNS = [
	'id',
	'name',
	'frameRate',
	'callToAction',
	'contact',
	'disclosure',
	'descriptionLimit',
	'storageQuotaGb',
	'version'
] as const;

export async function channelSettings(channelId: string) {
	return db
		.selectFrom('channel')
		.select(SETTINGS_COLUMNS)
		.where('id', '=', channelId)
		.executeTakeFirstOrThrow();
}

export async function updateChannelSettings(
	channelId: string,
	input: z.infer<typeof channelSettingsSchema>
) {
	const { version, ...values } = input;
	const updated = await db
		.updateTable('channel')
		.set((eb) => ({ ...values, version: eb('version', '+', 1) }))
		.where('id', '=', channelId)
		.where('version', '=', version)
		.returning(SETTINGS_COLUMNS)
		.executeTakeFirst();
	if (!updated) {
		const current = await channelSettings(channelId);
		throw new DomainError(
			409,
			'Someone saved these settings while you were editing. Review their version below, then save again.',
			undefined,
			{ current }
		);
	}
	return updated;
}
