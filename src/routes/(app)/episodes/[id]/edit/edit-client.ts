/** The edit page's calls to /api/episodes/[id]/…: every change answers with the new edit state. */
import type { EditChapter, EditState } from '$lib/server/edit/edit';

export type { EditChapter, EditState };

export type Answer<T> =
	| { ok: true; data: T }
	| {
			ok: false;
			status: number;
			error: string;
			issues?: Record<string, string[]>;
			state?: EditState;
	  };

async function call<T>(path: string, method: string, body?: unknown): Promise<Answer<T>> {
	let response: Response;
	try {
		response = await fetch(path, {
			method,
			headers: body === undefined ? {} : { 'content-type': 'application/json' },
			body: body === undefined ? undefined : JSON.stringify(body)
		});
	} catch {
		return {
			ok: false,
			status: 0,
			error: 'The server did not answer. Check the connection; nothing was changed.'
		};
	}
	const answer = await response.json().catch(() => null);
	if (response.ok) return { ok: true, data: answer as T };
	return {
		ok: false,
		status: response.status,
		error: answer?.error ?? `The server answered ${response.status}; nothing was changed.`,
		issues: answer?.issues,
		state: answer?.state
	};
}

export function editClient(episodeId: string) {
	const base = `/api/episodes/${encodeURIComponent(episodeId)}`;
	return {
		setCut: (duration: string, expectedFrames: number | null) =>
			call<EditState>(`${base}/cut`, 'PATCH', { duration, expectedFrames }),
		addChapter: (input: {
			start?: string;
			startFrame?: number;
			title: string;
			url?: string | null;
			partId?: string | null;
		}) => call<{ chapter: EditChapter; state: EditState }>(`${base}/chapters`, 'POST', input),
		updateChapter: (
			chapterId: string,
			input: { version: number; start?: string; startFrame?: number; title?: string }
		) =>
			call<{ chapter: EditChapter; state: EditState }>(
				`${base}/chapters/${encodeURIComponent(chapterId)}`,
				'PATCH',
				input
			),
		removeChapter: (chapterId: string, version: number) =>
			call<{ removed: EditChapter; state: EditState }>(
				`${base}/chapters/${encodeURIComponent(chapterId)}?version=${version}`,
				'DELETE'
			)
	};
}
