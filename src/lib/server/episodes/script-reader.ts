/**
 * Reads scripts: Markdown → sanitised HTML, Markdown → spoken words. Everything on the server that
 * reads a script's Markdown goes through these functions, so how a read is done (and bounded) is
 * decided in one place. For now they call the renderer and the counter in-process.
 */
import { renderScriptMarkdown } from '$lib/server/markdown';
import { countSpokenWords } from '$lib/script/timing';

/** Starts whatever reads scripts ahead of the first request (nothing to start yet). */
export async function startScriptReaders(): Promise<void> {}

/** A script's Markdown as sanitised HTML. */
export async function scriptHtml(markdown: string): Promise<string> {
	return renderScriptMarkdown(markdown);
}

/** The spoken words of a script (rules in `$lib/script/timing`). */
export async function spokenWords(markdown: string): Promise<number> {
	return countSpokenWords(markdown);
}

/** Spoken words of several scripts, in order. */
export function spokenWordsEach(markdowns: readonly string[]): Promise<number[]> {
	return Promise.all(markdowns.map(spokenWords));
}
