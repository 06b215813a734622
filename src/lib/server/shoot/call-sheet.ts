/**
 * What the call sheet adds to the shoot day: the episode's assigned crew, shown when nobody has
 * been called for the day yet, so a new day's sheet still says who works on the episode.
 */
import { db } from '../db';
import type { Role } from '../db/types';

/** The order the crew is listed on the sheet: in front of the camera first, then behind it. */
const SHEET_ORDER: Role[] = ['host', 'camera', 'editor', 'producer', 'merch'];

export interface AssignedPerson {
	id: string;
	name: string;
	roles: Role[];
}

/** The people assigned to the episode (host, camera operator, editor, producer), each once with their roles. */
export async function episodeCrewFor(
	channelId: string,
	episodeId: string
): Promise<AssignedPerson[]> {
	const rows = await db
		.selectFrom('episodeAssignment')
		.innerJoin('episode', 'episode.id', 'episodeAssignment.episodeId')
		.innerJoin('person', 'person.id', 'episodeAssignment.personId')
		.select(['person.id', 'person.name', 'episodeAssignment.role'])
		.where('episode.id', '=', episodeId)
		.where('episode.channelId', '=', channelId)
		.execute();
	rows.sort((a, b) => SHEET_ORDER.indexOf(a.role) - SHEET_ORDER.indexOf(b.role));
	const people = new Map<string, AssignedPerson>();
	for (const row of rows) {
		const person = people.get(row.id) ?? { id: row.id, name: row.name, roles: [] };
		person.roles.push(row.role);
		people.set(row.id, person);
	}
	return [...people.values()];
}
