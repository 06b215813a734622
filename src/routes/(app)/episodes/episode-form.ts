/** Reads the episode form (new and edit share it) into the shape the episode schemas take. */
import { ASSIGNABLE_ROLES } from '$lib/schemas/episodes-constants';

export function episodeFormValues(form: FormData) {
	const text = (name: string) => String(form.get(name) ?? '');
	return {
		title: text('title'),
		slug: text('slug').trim().toLowerCase(),
		logline: text('logline'),
		targetRuntimeSeconds: text('targetRuntime'),
		frameRate: text('frameRate'),
		publishDate: text('publishDate'),
		buildIds: form.getAll('buildIds').map(String),
		assignments: Object.fromEntries(
			ASSIGNABLE_ROLES.map((role) => [role, text(`assign-${role}`) || null])
		)
	};
}

export type EpisodeFormValues = ReturnType<typeof episodeFormValues>;
