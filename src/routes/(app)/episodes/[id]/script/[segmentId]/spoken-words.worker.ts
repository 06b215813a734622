/**
 * The editor's word counter, in a Web Worker so the page never waits for `marked` (quadratic on
 * some inputs: a 100,000-character script of `_a_a…` would freeze the tab for half a minute).
 * `live-word-count.ts` sends each text, stops a count that runs over SCRIPT_READ_LIMIT_MS by
 * ending this worker, and starts a fresh one.
 */
import { countSpokenWords } from '$lib/script/timing';

export type SpokenWordsMessage =
	{ type: 'ready' } | { type: 'counted'; id: number; words: number | null };

const scope = self as unknown as {
	postMessage(message: SpokenWordsMessage): void;
	onmessage: ((event: MessageEvent<{ id: number; markdown: string }>) => void) | null;
};

scope.onmessage = (event) => {
	let words: number | null;
	try {
		words = countSpokenWords(event.data.markdown);
	} catch {
		// `> > > …` deep enough overflows marked's stack: the page shows the rough count instead.
		words = null;
	}
	scope.postMessage({ type: 'counted', id: event.data.id, words });
};

// Compile the counter's code paths before the first real text (a cold first count is slow).
for (let round = 0; round < 10; round++) {
	countSpokenWords(
		'# Step\n\n**Loosen** the _lug_ nuts, [the kit](https://parts.example) `WX-2210`\n\n- one\n- two\n\n| a | b |\n|--|--|\n| c | d |\n\n> say it [[B-roll]]'
	);
}
scope.postMessage({ type: 'ready' });
