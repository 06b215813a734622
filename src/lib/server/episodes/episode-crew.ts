/**
 * An episode's crew: who holds each role (host, camera operator, editor, producer). An assignee must
 * be an active crew member of the channel holding that role; anyone newly assigned by someone else
 * gets a mail.
 */
import type { Role } from '../db/types';
import { DomainError } from '../http/api';
import { queueMail } from '../mail/outbox';
import { assignmentMail } from '../mail/episode-messages';
import type { Actor, Executor } from './episodes';
import { ASSIGNABLE_ROLES, type AssignableRole } from '$lib/schemas/episodes';
import { ROLE_LABELS } from '$lib/roles';

/** Role → person id of an episode's crew. */
export function assignmentMap(
	assignments: readonly { role: string; personId: string }[]
): Partial<Record<Role, string>> {
	return Object.fromEntries(
		assignments.map((assignment) => [assignment.role, assignment.personId])
	);
}

/** Every assignee must be an active crew member holding that role in this channel. */
export async function checkAssignments(
	executor: Executor,
	channelId: string,
	assignments: Partial<Record<AssignableRole, string | null>>
): Promise<void> {
	const wanted = Object.entries(assignments).filter(
		(entry): entry is [AssignableRole, string] => typeof entry[1] === 'string'
	);
	if (wanted.length === 0) return;
	const members = await executor
		.selectFrom('membership')
		.select(['personId', 'roles'])
		.where('channelId', '=', channelId)
		.where('disabledAt', 'is', null)
		.where(
			'personId',
			'in',
			wanted.map(([, personId]) => personId)
		)
		.execute();
	const issues: Record<string, string[]> = {};
	for (const [role, personId] of wanted) {
		const member = members.find((candidate) => candidate.personId === personId);
		if (!member) issues[`assignments.${role}`] = ['That person is not on this channel’s crew.'];
		else if (!member.roles.includes(role))
			issues[`assignments.${role}`] = [
				`That person does not have the ${ROLE_LABELS[role].toLowerCase()} role: give it to them under Crew first.`
			];
	}
	if (Object.keys(issues).length)
		throw new DomainError(400, 'Some crew assignments need fixing.', issues);
}

/** Replaces the assignments named in `assignments` (null removes one); mails anyone newly assigned. */
export async function writeAssignments(
	trx: Executor,
	context: {
		channelId: string;
		episodeId: string;
		episodeTitle: string;
		actor: Actor;
		origin: string;
	},
	assignments: Partial<Record<AssignableRole, string | null | undefined>>
): Promise<void> {
	const before = assignmentMap(
		await trx
			.selectFrom('episodeAssignment')
			.select(['role', 'personId'])
			.where('episodeId', '=', context.episodeId)
			.execute()
	);
	for (const role of ASSIGNABLE_ROLES) {
		if (!(role in assignments) || assignments[role] === undefined) continue;
		const personId = assignments[role] ?? null;
		if (before[role] === personId) continue;
		await trx
			.deleteFrom('episodeAssignment')
			.where('episodeId', '=', context.episodeId)
			.where('role', '=', role)
			.execute();
		if (personId === null) continue;
		await trx
			.insertInto('episodeAssignment')
			.values({ episodeId: context.episodeId, role, personId })
			.execute();
		if (personId === context.actor.id) continue;
		const person = await trx
			.selectFrom('person')
			.select(['email', 'name'])
			.where('id', '=', personId)
			.executeTakeFirstOrThrow();
		await queueMail(trx, {
			to: person.email,
			channelId: context.channelId,
			...assignmentMail({
				personName: person.name,
				assignerName: context.actor.name,
				role: ROLE_LABELS[role],
				episodeTitle: context.episodeTitle,
				link: `${context.origin}/episodes/${context.episodeId}`
			})
		});
	}
}
