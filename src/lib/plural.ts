/**
 * Counted words for the pages: "1 file", "0 files", "2 files". English has two plural forms,
 * singular for exactly one and plural for everything else, zero included (Unicode CLDR plural
 * rules, English cardinal: "one" when i = 1 and v = 0).
 */

/** The word for `count` things: `singular` for exactly 1, else `plural` (default: singular + "s"). */
export function wordFor(count: number, singular: string, plural = `${singular}s`): string {
	return count === 1 ? singular : plural;
}

/** The count and its word, "1 shot" or "3 shots". */
export function counted(count: number, singular: string, plural = `${singular}s`): string {
	return `${count} ${wordFor(count, singular, plural)}`;
}
