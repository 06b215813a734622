import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { moveStage, stageHistory, stageReportFor } from '$lib/server/episodes/stage-moves';
import { stageMoveSchema } from '$lib/schemas/episodes';
import type { RequestHandler } from './$types';

/** Where the episode stands, what its next gate says (a dry run), and the history of moves. */
export const GET: RequestHandler = api(async (event) => {
	const { channel, person, roles } = requireRole(event);
	const [report, history] = await Promise.all([
		stageReportFor(channel.id, event.params.id, { id: person.id, roles }),
		stageHistory(channel.id, event.params.id)
	]);
	return json({ ...report, history });
});

/**
 * Moves the episode `{ from, to, note }`. 200 with the gate result when it moved; 422 with
 * `gate.reasons` when a forward gate refuses; 403 when this person may not make the move (a producer,
 * or the assignee of the current stage's role going forward: see src/lib/stages.ts).
 */
export const POST: RequestHandler = api(async (event) => {
	const { channel, person, roles } = requireRole(event);
	const input = await readJson(event, stageMoveSchema);
	return json(
		await moveStage(channel.id, { ...person, roles }, event.params.id, input, event.url.origin)
	);
});
