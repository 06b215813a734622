/**
 * What a key does in a search field whose list of matches is open (the keys of the WAI-ARIA
 * combobox pattern; tests/REFERENCES.md, "Accessibility"): Down and Up move the highlight round
 * the list, Enter picks the highlighted row, Escape closes the list. Null: the key is not the
 * list's (let the field have it).
 */
export type ListKeyAction = { highlight: number } | { choose: number } | { close: true } | null;

export function listKeyAction(
	key: string,
	open: boolean,
	count: number,
	highlighted: number
): ListKeyAction {
	if (!open) return null;
	if (key === 'Escape') return { close: true };
	if (count === 0) return null;
	if (key === 'ArrowDown') return { highlight: (highlighted + 1) % count };
	if (key === 'ArrowUp') return { highlight: (highlighted - 1 + count) % count };
	if (key === 'Enter') return { choose: Math.min(highlighted, count - 1) };
	return null;
}
