/**
 * Puts back what was typed into form fields before the page hydrated. The capture half is the small
 * inline script in `src/app.html`, which must run before any bundle arrives; this half runs once
 * the root layout mounts. Each restored field gets an `input` event so state tied to it follows.
 */
type Typed = { value: string } | { checked: boolean };
interface Capture {
	typed: Map<string, Typed>;
	stop(): void;
}

export function restoreTypedBeforeReady(doc: Document = document): number {
	const win = doc.defaultView as (Window & { __typedBeforeReady?: Capture }) | null;
	const capture = win?.__typedBeforeReady;
	if (!capture) return 0;
	capture.stop();
	delete win.__typedBeforeReady;
	let restored = 0;
	for (const [id, typed] of capture.typed) {
		const field = doc.getElementById(id);
		if (!(
			field instanceof HTMLInputElement ||
			field instanceof HTMLTextAreaElement ||
			field instanceof HTMLSelectElement
		))
			continue;
		if ('checked' in typed) {
			if (!(field instanceof HTMLInputElement) || field.checked === typed.checked) continue;
			field.checked = typed.checked;
			field.dispatchEvent(new Event('change', { bubbles: true }));
		} else {
			if (field.value === typed.value) continue;
			field.value = typed.value;
			field.dispatchEvent(new Event('input', { bubbles: true }));
		}
		restored++;
	}
	return restored;
}
