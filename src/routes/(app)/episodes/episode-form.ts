/** Reads the episode form (new and edit share it) into the shape the episode schemas take. */
import { ASSIGNABLE_ROLES } from '$lib/schemas/episodes-constants';

/** The timecode form's choice: '' the rate's usual form (null); anything unknown is left for the schema to refuse. */
function timecodeFormValue(choice: string): boolean | null | string {
	if (choice === '') return null;
	if (choice === 'drop-frame') return true;
	if (choice === 'non-drop') return false;
	return choice;
}

export function episodeFormValues(form: FormData) {
	const text = (name: string) => String(form.get(name) ?? '');
	return {
		title: text('title'),
		slug: text('slug').trim().toLowerCase(),
		logline: text('logline'),
		targetRuntimeSeconds: text('targetRuntime'),
		frameRate: text('frameRate'),
		timecodeDropFrame: timecodeFormValue(text('timecodeForm')),
		timecodeStart: text('timecodeStart').trim() || '00:00:00:00',
		publishDate: text('publishDate'),
		buildIds: form.getAll('buildIds').map(String),
		assignments: Object.fromEntries(
			ASSIGNABLE_ROLES.map((role) => [role, text(`assign-${role}`) || null])
		)
	};
}

export type EpisodeFormValues = ReturnType<typeof episodeFormValues>;
