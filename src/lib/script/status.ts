/**
 * The script's approval state as every page shows it: the stored status, except that an approved
 * script whose text changed since shows as "changed". Pure; the server computes `changed` in one
 * place (server/episodes/script-status.ts) and every chip, list row and worklist item reads this.
 */
import type { ScriptStatus } from '$lib/gates';

export type ScriptShown = ScriptStatus | 'changed';

/** The one rule: approved and changed since reads as "changed"; anything else as stored. */
export function shownScriptStatus(status: string, changedSinceApproval: boolean): ScriptShown {
	if (status === 'approved' && changedSinceApproval) return 'changed';
	return (
		(['draft', 'submitted', 'approved', 'returned'] as const).find((s) => s === status) ?? 'draft'
	);
}

/** The chip's words. */
export const SCRIPT_SHOWN_WORDS: Record<ScriptShown, string> = {
	draft: 'Script draft',
	submitted: 'Awaiting approval',
	approved: 'Script approved',
	returned: 'Returned with comments',
	changed: 'Changed since approval'
};
