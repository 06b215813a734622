/** The edit page's calls to /api/episodes/[id]/…: every change answers with the new edit state. */
import type { EditChapter, EditState } from '$lib/server/edit/edit';

import { call as callApi, type Answer as ApiAnswer } from '$lib/api-call';

export type { EditChapter, EditState };
type ApiFailure = Extract<ApiAnswer<never>, { ok: false }>;

export type Answer<T> = { ok: true; data: T } | (ApiFailure & { state?: EditState });

/** The shared API call; a refusal's current edit state (`state`) comes up beside its words. */
async function call<T>(path: string, method: string, body?: unknown): Promise<Answer<T>> {
	const answer = await callApi<T>(path, { method, json: body });
	if (answer.ok) return answer;
	return { ...answer, state: answer.extra?.state as EditState | undefined };
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
