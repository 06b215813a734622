/** Personal API tokens: shown once at creation, stored as a SHA-256 hash, revocable. */
import { db } from '../db';
import { notFound } from '../http/api';
import { hashSecret, newSecret } from './secrets';
import { isUuid } from './identity';

export async function listTokens(channelId: string, personId: string) {
	return db
		.selectFrom('apiToken')
		.select(['id', 'label', 'tokenHint', 'createdAt', 'lastUsedAt', 'revokedAt'])
		.where('personId', '=', personId)
		.where('channelId', '=', channelId)
		.orderBy('createdAt', 'desc')
		.execute();
}

export async function createToken(channelId: string, personId: string, label: string) {
	const secret = newSecret('wr_');
	const row = await db
		.insertInto('apiToken')
		.values({
			personId,
			channelId,
			label,
			tokenHash: hashSecret(secret),
			tokenHint: secret.slice(0, 7) + '…'
		})
		.returning(['id', 'label', 'tokenHint', 'createdAt'])
		.executeTakeFirstOrThrow();
	return { ...row, token: secret };
}

/** Revokes one of the person's tokens for the channel they are working in (the list shows no others). */
export async function revokeToken(channelId: string, personId: string, tokenId: string) {
	if (!isUuid(tokenId)) throw notFound('That token');
	const result = await db
		.updateTable('apiToken')
		.set({ revokedAt: new Date() })
		.where('id', '=', tokenId)
		.where('personId', '=', personId)
		.where('channelId', '=', channelId)
		.where('revokedAt', 'is', null)
		.executeTakeFirst();
	if (Number(result.numUpdatedRows) === 0) throw notFound('That token');
}
