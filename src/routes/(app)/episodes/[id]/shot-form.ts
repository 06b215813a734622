/**
 * Reads the add-shot form (the segment page and the shot list page share the field names) into
 * what shotCreateSchema takes.
 */
export function shotFormValues(form: FormData) {
	const text = (key: string) => String(form.get(key) ?? '');
	return {
		what: text('what'),
		angle: text('angle'),
		roll: text('roll') || 'A',
		camera: text('camera'),
		notes: text('notes')
	};
}
