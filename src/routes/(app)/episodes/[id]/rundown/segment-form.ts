/** Reads the segment forms (add and edit share the field names) into what the segment schemas take. */
export function segmentFormValues(form: FormData) {
	const text = (name: string) => String(form.get(name) ?? '');
	return {
		kind: text('kind'),
		title: text('title'),
		plannedSeconds: text('planned'),
		buildId: text('buildId') || null,
		needsFootage: form.get('needsFootage') === 'on' || form.get('needsFootage') === 'true',
		hazards: form.getAll('hazards').map(String),
		promiseEpisodeId: text('promiseEpisodeId') || null,
		promiseTitle: text('promiseTitle').trim() || null
	};
}

export type SegmentFormValues = ReturnType<typeof segmentFormValues>;
