/**
 * A Svelte action for a row of tabs that scrolls sideways on a phone: it brings the tab for the
 * current page (`aria-current="page"`) into view, so the person sees where they are. Pass the path
 * as the parameter so it runs again after each navigation.
 */
export function currentInView(node: HTMLElement, _path?: string) {
	const show = () => {
		const current = node.querySelector<HTMLElement>('[aria-current="page"]');
		if (!current || node.scrollWidth <= node.clientWidth) return;
		const row = node.getBoundingClientRect();
		const tab = current.getBoundingClientRect();
		if (tab.left >= row.left && tab.right <= row.right) return;
		// Centre it; only the row scrolls, never the page.
		node.scrollLeft += tab.left - row.left - (row.width - tab.width) / 2;
	};
	show();
	return { update: show };
}
