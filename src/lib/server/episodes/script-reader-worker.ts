/**
 * The inside of one script-reader worker thread (the pool is `script-reader.ts`). Everything
 * `marked` does for the server happens here and never on the main thread: its lexer is quadratic
 * on some inputs (a script of `_a_a_a…` takes half a minute), and a worker is the one place such a
 * read can be stopped. The pool starts this very module as the worker's code, so the module
 * exports its own address and serves jobs only when it is running as a script reader. The pool
 * imports it too (for that address), so the renderer and counter are imported only inside a
 * worker: the main thread never loads sanitize-html.
 */
import { isMainThread, parentPort, workerData } from 'node:worker_threads';

/** Where this module's code is: the `.ts` source in tests and `vite dev`, a built chunk in production. */
export const scriptReaderWorkerUrl = import.meta.url;

/** Marks a worker started by the pool, so importing this module anywhere else serves nothing. */
export const SCRIPT_READER_ROLE = 'wrenchroll-script-reader';

/** `both`: the HTML and the word count of one text in one read (a preview), so one core does it. */
export type ScriptJobKind = 'html' | 'words' | 'both';

export interface ScriptJob {
	id: number;
	kind: ScriptJobKind;
	markdown: string;
}

export type ScriptReaderMessage =
	| { type: 'ready' }
	| { type: 'done'; id: number; html?: string; words?: number }
	| { type: 'failed'; id: number; reason: string };

type Readers = {
	renderScriptMarkdown(markdown: string): string;
	countSpokenWords(markdown: string): number;
};

function answer(
	{ renderScriptMarkdown, countSpokenWords }: Readers,
	job: ScriptJob
): ScriptReaderMessage {
	try {
		if (job.kind === 'html')
			return { type: 'done', id: job.id, html: renderScriptMarkdown(job.markdown) };
		if (job.kind === 'words')
			return { type: 'done', id: job.id, words: countSpokenWords(job.markdown) };
		return {
			type: 'done',
			id: job.id,
			html: renderScriptMarkdown(job.markdown),
			words: countSpokenWords(job.markdown)
		};
	} catch (failure) {
		// marked recurses once per nesting level, so `> > > …` can overflow the stack; the pool
		// answers with its plain-text fallback instead.
		return { type: 'failed', id: job.id, reason: (failure as Error)?.message ?? String(failure) };
	}
}

/**
 * A short script using every construct the editor offers. Reading it before saying "ready"
 * compiles marked's and sanitize-html's code paths, so a reader's first real script is not slowed
 * by that (a cold first read of two words takes longer than the time limit).
 */
const WARM_UP_SCRIPT = [
	'# Rear axle',
	'',
	'**Loosen** the _lug_ nuts ~~first~~, then un**bolt** the `WX-2210` bracket. [[B-roll: *wrench*]]',
	'',
	'- [ ] stands under the rails',
	'- [x] wheel chocks, see [the kit](https://parts.example/kit "Kit") or www.parts.example',
	'',
	'1. lift',
	'2. level &amp; check <b>twice</b> <!-- note -->',
	'',
	'> say it slow  ',
	'> then stop',
	'',
	'| Part | Torque |',
	'|:--|--:|',
	'| lug nut | 95 ft-lbs |',
	'',
	'```',
	'torque 95',
	'```',
	'',
	'    indented code',
	'',
	'---',
	'crew@wrenchroll.example ![jack](jack.jpg) [ref][r]',
	'',
	'[r]: https://parts.example/r'
].join('\n');

if (!isMainThread && parentPort && workerData?.role === SCRIPT_READER_ROLE) {
	const port = parentPort;
	const [{ renderScriptMarkdown }, { countSpokenWords }] = await Promise.all([
		import('./markdown'),
		import('$lib/script/timing')
	]);
	const readers: Readers = { renderScriptMarkdown, countSpokenWords };
	for (let round = 0; round < 10; round++) {
		renderScriptMarkdown(WARM_UP_SCRIPT);
		countSpokenWords(WARM_UP_SCRIPT);
	}
	// And a couple of longer reads: a fresh thread's first large script is otherwise two to three
	// times slower than later ones (measured on 100,000 characters), which is over the limit.
	for (let round = 0; round < 2; round++) {
		const longer = `${WARM_UP_SCRIPT}\n\n`.repeat(25) + round;
		renderScriptMarkdown(longer);
		countSpokenWords(longer);
	}
	port.on('message', (job: ScriptJob) => port.postMessage(answer(readers, job)));
	port.postMessage({ type: 'ready' } satisfies ScriptReaderMessage);
}
