import { expect } from 'vitest';
import { sql, type Visitor } from './http';

/** Saves a segment's script through the app (PUT with the version it holds now) and expects 200. */
export async function saveScript(visitor: Visitor, segmentId: string, body: string): Promise<void> {
	const [{ version }] = await sql(`SELECT version FROM segment_script WHERE segment_id = $1`, [
		segmentId
	]);
	const saved = await visitor.api(`/api/segments/${segmentId}/script`, {
		method: 'PUT',
		json: { body, version }
	});
	expect(saved.status).toBe(200);
}
