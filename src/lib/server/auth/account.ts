/**
 * A person's own account: the name the crew sees and their password. Scoped to the person, not a
 * channel: a name and a password are the same in every channel they belong to.
 */
import { db } from '../db';
import { voidLinks } from '../channel/crew';
import { DomainError } from '../http/api';
import { checkPassword, hashPassword, passwordProblem } from './passwords';
import { signInAddressCounter } from './sessions';
import { clearCounter, giveBack, takeAttempt } from './throttle';
import { waitInWords } from '$lib/wait-in-words';

export async function renamePerson(personId: string, name: string): Promise<{ name: string }> {
	await db.updateTable('person').set({ name }).where('id', '=', personId).execute();
	return { name };
}

/**
 * Changes the password after checking the current one. A wrong current password counts against the
 * same per-address limit as a failed sign-in (so this form is no way around it); the right one gives
 * its count back. Every other session of the person ends; `keepSessionId` (the one asking) stays.
 * Unused reset and unlock links end too. API tokens stay: they are credentials of their own,
 * revoked on the Account page.
 */
export async function changePassword(
	personId: string,
	keepSessionId: string | null,
	input: { currentPassword: string; password: string }
): Promise<{ changed: true }> {
	const person = await db
		.selectFrom('person')
		.select(['email', 'passwordHash'])
		.where('id', '=', personId)
		.executeTakeFirstOrThrow();
	const counter = signInAddressCounter(person.email);
	const taken = await takeAttempt([counter]);
	if (!taken.ok) {
		const message = `Too many wrong passwords for this account. Try again in ${waitInWords(taken.retryAfter)}.`;
		throw new DomainError(429, message, { currentPassword: [message] });
	}
	if (!(await checkPassword(person.passwordHash, input.currentPassword))) {
		const message = 'That is not your current password.';
		throw new DomainError(400, message, { currentPassword: [message] });
	}
	await giveBack([counter]);
	const problem = passwordProblem(input.password);
	if (problem) throw new DomainError(400, problem, { password: [problem] });
	const passwordHash = await hashPassword(input.password);
	await db.transaction().execute(async (trx) => {
		await trx.updateTable('person').set({ passwordHash }).where('id', '=', personId).execute();
		let others = trx.deleteFrom('personSession').where('personId', '=', personId);
		if (keepSessionId) others = others.where('id', '!=', keepSessionId);
		await others.execute();
		await voidLinks(trx, personId, ['reset', 'unlock']);
	});
	await clearCounter(counter);
	return { changed: true };
}
