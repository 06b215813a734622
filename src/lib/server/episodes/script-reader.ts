/**
 * Reads scripts (Markdown → sanitised HTML, Markdown → spoken words) in a small pool of worker
 * threads, each read stopped after SCRIPT_READ_LIMIT_MS.
 *
 * Why: `marked`'s lexer is quadratic on some inputs well inside the script limit (100,000
 * characters of `_a_a…` hold a thread for half a minute; `> > > …` overflows its stack), and even an
 * ordinary script at the limit takes around 100 ms per read. On the main thread that froze every
 * user. Here the main thread only posts the text and waits; a read that runs over the limit is
 * answered with a plain fallback (the text escaped as paragraphs, or the rough word count from
 * `$lib/script/timing`), its worker is ended and a fresh one started. Texts that ran over are
 * remembered (by hash) so reopening the same rundown does not pay the limit again.
 *
 * Everything on the server that reads a script's Markdown goes through here; ESLint refuses
 * `countSpokenWords` and `$lib/server/episodes/markdown` anywhere else in `src/`.
 */
import { createHash } from 'node:crypto';
import { availableParallelism } from 'node:os';
import { Worker, type WorkerOptions } from 'node:worker_threads';
import { SCRIPT_READ_LIMIT_MS, roughSpokenWords } from '$lib/script/timing';
// Types only: the worker module itself is loaded by import() so that it stays a chunk of its own
// in the build, which is what each worker runs.
import type {
	ScriptJob,
	ScriptJobKind,
	ScriptReaderMessage
} from '$lib/server/episodes/script-reader-worker';

export { SCRIPT_READ_LIMIT_MS };

/**
 * How many reads run at once: two at least, so a preview's HTML and word count run side by side
 * (each within the limit), and at most four; the main thread keeps a core of its own where there
 * are more. One more reader is kept started and idle beside the busy ones: when reads run over and
 * their workers are replaced (a start takes about 0.3 s, more on a busy machine), the spare takes
 * the next read at once instead of it waiting for a start.
 *
 * Readers cost memory (about 15 MB each, more than 20 MB resident), so the pool starts its first
 * reader with the first read after start-up, not at boot (a server that only takes uploads never
 * holds one; that first read waits for the start, about 0.3 s), starts more only while reads are
 * running or queued (up to SCRIPT_READER_COUNT running plus the spare), and ends readers beyond
 * that after they have been idle for a while. The spare itself is ended once nobody has read a
 * script for lastReaderLifeMs, so a server at rest holds no reader.
 */
export const SCRIPT_READER_COUNT = Math.max(2, Math.min(4, availableParallelism() - 1));
const READERS_KEPT = SCRIPT_READER_COUNT + 1;

/** A reader the pool no longer needs is ended after being idle this long. */
let idleReaderLifeMs = 60_000;

/** The pool keeps its spare until nobody has asked for a read this long. */
let lastReaderLifeMs = 10 * 60_000;

/** How many texts' word counts (and which texts ran over the limit) are remembered. */
const REMEMBERED_TEXTS = 2000;

/**
 * How long a fallback answer is remembered for its text: reopening a rundown with a hostile script
 * then costs nothing, while a text that ran over only because the machine was busy is tried again
 * a minute later.
 */
const FALLBACK_MEMORY_MS = 60_000;

/** A reader not ready by then is ended and counts as a failed start (its module hangs, say). */
const START_LIMIT_MS = 30_000;

/** A worker that fails to start this many times in a row means something is broken: answer with fallbacks for a while. */
const START_FAILURES_BEFORE_PAUSE = 3;
const PAUSE_AFTER_START_FAILURES_MS = 10_000;

/**
 * A read still running this long before the limit gets its fallback word count made meanwhile, on
 * the main thread (which is only waiting): the rough count of a long text takes tens of
 * milliseconds (30–70 ms for 100,000 characters of `_a_a…`), which would otherwise come on top of
 * the limit. Reads of scripts up to about 40,000 characters end before then and pay nothing.
 */
const ROUGH_COUNT_LEAD_MS = 100;

/** Plenty for a 100,000-character script; a read that needs more is ended like a slow one. */
const READER_HEAP_MB = 256;

/** Shown above a script whose Markdown could not be read in time, so nobody wonders where the formatting went. */
export const PLAIN_SCRIPT_NOTICE =
	'<p><strong>Shown as plain text.</strong> The formatting of this script took too long to work out, so it is shown exactly as typed. Long runs of *, _, [, ` or &gt; usually cause this: break them up.</p>\n';

/** Shown above a script whose formatting would hide every one of its words. */
export const HIDDEN_WORDS_NOTICE =
	'<p><strong>Shown as plain text.</strong> Formatted, this script would show none of its words, so it is shown exactly as typed. A line starting with three or more ` or ~ opens a code block and hides the rest of that line: break it up.</p>\n';

const LETTER_OR_DIGIT = /[\p{L}\p{N}]/u;

/** True when the Markdown has letters or digits and the rendered HTML shows none of them. */
function hidesAllWords(markdown: string, html: string): boolean {
	if (!LETTER_OR_DIGIT.test(markdown)) return false;
	const shown = html.replace(/<[^>]*>/g, '').replace(/&[#\w]+;/g, ' ');
	return !LETTER_OR_DIGIT.test(shown);
}

/** The fallback page for a script: every character kept, escaped, blank lines as paragraph breaks and single newlines as line breaks. */
export function plainScriptHtml(markdown: string, notice = PLAIN_SCRIPT_NOTICE): string {
	const escaped = markdown
		.replace(/\r\n?/g, '\n')
		.replace(/&/g, '&amp;')
		.replace(/</g, '&lt;')
		.replace(/>/g, '&gt;')
		.replace(/"/g, '&quot;')
		.replace(/'/g, '&#39;');
	const paragraphs = escaped
		.split(/\n[ \t]*\n/)
		.filter((paragraph) => paragraph.trim() !== '')
		.map((paragraph) => `<p>${paragraph.split('\n').join('<br />\n')}</p>\n`);
	return notice + paragraphs.join('');
}

/** How one read ended: its answer, or why there is none. */
type Outcome =
	| { type: 'done'; html?: string; words?: number }
	/** The reader threw (say, a stack overflow on `> > > …`): the same text always will. */
	| { type: 'failed' }
	/** It ran over SCRIPT_READ_LIMIT_MS; the rough word count, when it was made while waiting. */
	| { type: 'over-limit'; rough?: number }
	/** No reader could take it (crashed, or readers failing to start). */
	| { type: 'unavailable' };

interface Job {
	kind: ScriptJobKind;
	markdown: string;
	settle(outcome: Outcome): void;
	/** The rough word count, made while a slow read runs (see ROUGH_COUNT_LEAD_MS). */
	rough?: number;
}

interface Reader {
	worker: Worker | null;
	ready: boolean;
	startTimer?: ReturnType<typeof setTimeout>;
	running: {
		id: number;
		job: Job;
		timer: ReturnType<typeof setTimeout>;
		roughTimer?: ReturnType<typeof setTimeout>;
	} | null;
	/** When it last finished a read (or became ready). */
	idleSince: number;
}

/** A small least-recently-used memory; an entry may carry an expiry time. */
class Remembered<T> {
	#entries = new Map<string, { value: T; until: number }>();
	get(key: string): T | undefined {
		const entry = this.#entries.get(key);
		if (!entry) return undefined;
		this.#entries.delete(key);
		if (entry.until < Date.now()) return undefined;
		this.#entries.set(key, entry);
		return entry.value;
	}
	set(key: string, value: T, forMilliseconds = Number.POSITIVE_INFINITY): void {
		this.#entries.delete(key);
		this.#entries.set(key, { value, until: Date.now() + forMilliseconds });
		if (this.#entries.size > REMEMBERED_TEXTS) {
			this.#entries.delete(this.#entries.keys().next().value as string);
		}
	}
}

class ScriptReaderPool {
	#readers = new Set<Reader>();
	#queue: Job[] = [];
	#nextId = 1;
	#startFailures = 0;
	#pausedUntil = 0;
	#workerModule: Promise<{ url: string; role: string }> | null = null;
	#readyWaiters: (() => void)[] = [];
	#retireTimer: ReturnType<typeof setTimeout> | null = null;
	/** When a read was last asked for (Date.now()); the spare is kept for lastReaderLifeMs after it. */
	#lastAsked = Number.NEGATIVE_INFINITY;
	/** Word counts by text: exact ones for good, rough ones until FALLBACK_MEMORY_MS has passed. */
	#words = new Remembered<number>();
	/** Texts whose HTML could not be made in time (or at all), for FALLBACK_MEMORY_MS. */
	#plainOnly = new Remembered<true>();

	/** Starts the readers (if they are not running) and resolves once all of them can take work. */
	ready(): Promise<void> {
		this.#lastAsked = Date.now();
		this.#fill();
		if (this.#allReady()) return Promise.resolve();
		return new Promise((resolve) => {
			this.#readyWaiters.push(resolve);
			this.#holdProcess();
		});
	}

	#allReady(): boolean {
		return this.#paused() || [...this.#readers].every((reader) => reader.ready);
	}

	async html(markdown: string): Promise<string> {
		if (markdown === '') return '';
		const key = digest(markdown);
		if (this.#plainOnly.get(key)) return plainScriptHtml(markdown);
		return this.#htmlOf(markdown, key, await this.#read('html', markdown));
	}

	/** The HTML from a read's outcome, or the plain fallback (remembered when the read ran over or failed). */
	#htmlOf(markdown: string, key: string, outcome: Outcome): string {
		if (outcome.type === 'done' && typeof outcome.html === 'string') {
			// Formatting that hides every word (a line opening a code fence with the words in its info
			// string, a tag-like run the sanitiser drops) shows the text as typed instead.
			return hidesAllWords(markdown, outcome.html)
				? plainScriptHtml(markdown, HIDDEN_WORDS_NOTICE)
				: outcome.html;
		}
		if (outcome.type !== 'unavailable') this.#plainOnly.set(key, true, FALLBACK_MEMORY_MS);
		return plainScriptHtml(markdown);
	}

	/**
	 * The HTML and the spoken words of one text from a single read in one reader: half the work of
	 * asking for each, and a text that runs over the limit holds one core, not two, so the server's
	 * own thread keeps a core to answer on.
	 */
	async both(markdown: string): Promise<{ html: string; words: number }> {
		if (markdown === '') return { html: '', words: 0 };
		const key = digest(markdown);
		const known = this.#words.get(key);
		if (this.#plainOnly.get(key))
			return { html: plainScriptHtml(markdown), words: known ?? (await this.words(markdown)) };
		if (known !== undefined) return { html: await this.html(markdown), words: known };
		const outcome = await this.#read('both', markdown);
		const html = this.#htmlOf(markdown, key, outcome);
		if (outcome.type === 'done' && typeof outcome.words === 'number') {
			this.#words.set(key, outcome.words);
			return { html, words: outcome.words };
		}
		const rough = roughOf(markdown, outcome);
		if (outcome.type !== 'unavailable') this.#words.set(key, rough, FALLBACK_MEMORY_MS);
		return { html, words: rough };
	}

	async words(markdown: string): Promise<number> {
		if (markdown.trim() === '') return 0;
		const key = digest(markdown);
		const known = this.#words.get(key);
		if (known !== undefined) return known;
		const outcome = await this.#read('words', markdown);
		if (outcome.type === 'done' && typeof outcome.words === 'number') {
			this.#words.set(key, outcome.words);
			return outcome.words;
		}
		const rough = roughOf(markdown, outcome);
		if (outcome.type !== 'unavailable') this.#words.set(key, rough, FALLBACK_MEMORY_MS);
		return rough;
	}

	#read(kind: ScriptJobKind, markdown: string): Promise<Outcome> {
		if (this.#paused()) return Promise.resolve({ type: 'unavailable' });
		this.#lastAsked = Date.now();
		return new Promise((settle) => {
			this.#queue.push({ kind, markdown, settle });
			this.#fill();
			this.#pump();
		});
	}

	#paused(): boolean {
		return Date.now() < this.#pausedUntil;
	}

	/**
	 * How many readers the pool wants now: the busy ones, one for each read waiting, and a spare
	 * (until nobody has asked for a read for lastReaderLifeMs).
	 */
	#wanted(): number {
		const busy = [...this.#readers].filter((reader) => reader.running).length;
		const spare = Date.now() - this.#lastAsked < lastReaderLifeMs ? 1 : 0;
		return Math.min(READERS_KEPT, busy + this.#queue.length + spare);
	}

	/** Starts readers (or waits for those starting) up to what the pool wants now. */
	#fill(): void {
		if (this.#paused()) return;
		while (this.#readers.size < this.#wanted()) this.#start();
	}

	/** How many readers are started or starting (for tests). */
	get size(): number {
		return this.#readers.size;
	}

	/**
	 * Ends readers beyond what the pool wants once they have been idle for idleReaderLifeMs. The
	 * timer runs while any reader is started, so the spare is ended too once it is no longer wanted.
	 */
	#retireLater(): void {
		if (this.#retireTimer || this.#readers.size === 0) return;
		this.#retireTimer = setTimeout(() => {
			this.#retireTimer = null;
			const now = Date.now();
			for (const reader of this.#readers) {
				if (this.#readers.size <= this.#wanted()) break;
				if (!reader.ready || reader.running || now - reader.idleSince < idleReaderLifeMs) continue;
				this.#readers.delete(reader);
				void reader.worker?.terminate();
			}
			this.#retireLater();
		}, idleReaderLifeMs);
		this.#retireTimer.unref();
	}

	#start(): void {
		this.#workerModule ??= import('$lib/server/episodes/script-reader-worker').then((module) => ({
			url: module.scriptReaderWorkerUrl,
			role: module.SCRIPT_READER_ROLE
		}));
		const reader: Reader = { worker: null, ready: false, running: null, idleSince: Date.now() };
		this.#readers.add(reader);
		this.#workerModule.then(
			(module) => this.#spawn(reader, module),
			(failure) => {
				this.#workerModule = null;
				this.#lost(reader, failure);
			}
		);
	}

	#spawn(reader: Reader, { url, role }: { url: string; role: string }): void {
		if (!this.#readers.has(reader)) return;
		const worker = startWorker(url, {
			workerData: { role },
			resourceLimits: { maxOldGenerationSizeMb: READER_HEAP_MB }
		});
		reader.worker = worker;
		reader.startTimer = setTimeout(() => void worker.terminate(), START_LIMIT_MS);
		reader.startTimer.unref();
		worker.on('message', (message: ScriptReaderMessage) => this.#heard(reader, message));
		worker.on('error', (failure) => this.#lost(reader, failure));
		worker.on('exit', (code) => this.#lost(reader, `exit code ${code}`));
		this.#holdProcess();
	}

	#heard(reader: Reader, message: ScriptReaderMessage): void {
		if (message.type === 'ready') {
			clearTimeout(reader.startTimer);
			reader.ready = true;
			reader.idleSince = Date.now();
			this.#startFailures = 0;
			if (this.#allReady()) for (const resolve of this.#readyWaiters.splice(0)) resolve();
			this.#pump();
			return;
		}
		const running = reader.running;
		if (!running || running.id !== message.id) return;
		clearTimeout(running.timer);
		clearTimeout(running.roughTimer);
		reader.running = null;
		reader.idleSince = Date.now();
		running.job.settle(
			message.type === 'done'
				? { type: 'done', html: message.html, words: message.words }
				: { type: 'failed' }
		);
		this.#pump();
	}

	/** A reader stopped by itself: a crash (out of memory, say), or it never started. */
	#lost(reader: Reader, failure: unknown): void {
		clearTimeout(reader.startTimer);
		if (!this.#readers.delete(reader)) return;
		if (reader.running) {
			clearTimeout(reader.running.timer);
			clearTimeout(reader.running.roughTimer);
			// Dying on a text (out of memory) says as much about the text as a thrown error.
			reader.running.job.settle({ type: 'failed' });
			reader.running = null;
		}
		console.error('A script reader stopped:', failure);
		if (!reader.ready) this.#startFailures += 1;
		if (this.#startFailures >= START_FAILURES_BEFORE_PAUSE) {
			this.#startFailures = 0;
			this.#pausedUntil = Date.now() + PAUSE_AFTER_START_FAILURES_MS;
			console.error(
				`Script readers failed to start ${START_FAILURES_BEFORE_PAUSE} times in a row; scripts are shown as plain text for ${PAUSE_AFTER_START_FAILURES_MS / 1000} s.`
			);
			for (const job of this.#queue.splice(0)) job.settle({ type: 'unavailable' });
			for (const resolve of this.#readyWaiters.splice(0)) resolve();
			this.#holdProcess();
			return;
		}
		this.#fill();
		this.#pump();
	}

	/**
	 * Readers keep the process alive only while there is work for them or someone waits for them to
	 * start, so a script that reads one text exits when done, and so does a server shutting down.
	 * (Called after the listeners are added: adding a 'message' listener refs a worker again.)
	 */
	#holdProcess(): void {
		const wanted =
			this.#queue.length > 0 ||
			this.#readyWaiters.length > 0 ||
			[...this.#readers].some((reader) => reader.running);
		for (const reader of this.#readers) {
			if (wanted) reader.worker?.ref();
			else reader.worker?.unref();
		}
	}

	#pump(): void {
		let running = [...this.#readers].filter((reader) => reader.running).length;
		for (const reader of this.#readers) {
			if (this.#queue.length === 0 || running >= SCRIPT_READER_COUNT) break;
			if (!reader.ready || reader.running || !reader.worker) continue;
			running += 1;
			const job = this.#queue.shift()!;
			const id = this.#nextId++;
			// The limit runs from the moment a started reader has the text, not while it waits in line.
			const timer = setTimeout(() => this.#overrun(reader), SCRIPT_READ_LIMIT_MS);
			const roughTimer =
				job.kind === 'html'
					? undefined
					: setTimeout(() => {
							job.rough ??= roughSpokenWords(job.markdown);
						}, SCRIPT_READ_LIMIT_MS - ROUGH_COUNT_LEAD_MS);
			reader.running = { id, job, timer, roughTimer };
			reader.worker.postMessage({ id, kind: job.kind, markdown: job.markdown } satisfies ScriptJob);
		}
		this.#fill();
		this.#retireLater();
		this.#holdProcess();
	}

	/** A read ran over the limit: answer with the fallback now, end its worker, start another. */
	#overrun(reader: Reader): void {
		const running = reader.running;
		if (!running || !this.#readers.delete(reader)) return;
		reader.running = null;
		clearTimeout(running.roughTimer);
		console.warn(
			`A script read (${running.job.kind}, ${running.job.markdown.length.toLocaleString('en')} characters) ran over ${SCRIPT_READ_LIMIT_MS} ms: answered with the fallback.`
		);
		running.job.settle({ type: 'over-limit', rough: running.job.rough });
		// Ending the worker is the only way to stop a regular expression mid-run; its exit is then ignored.
		void reader.worker?.terminate();
		// Replaced one for one, whatever the pool wants this moment: hostile scripts come in pairs
		// (HTML and word count) and repeat; the idle ones are ended later.
		this.#start();
		this.#fill();
		this.#pump();
	}
}

/**
 * Starts a reader's worker. A build's chunk is plain JavaScript; the source (in tests and
 * `vite dev`) is TypeScript, so there a one-line script registers tsx's loader in the worker first
 * (tsx is a devDependency, found from the working directory; this branch never runs in a build).
 */
function startWorker(url: string, options: WorkerOptions): Worker {
	if (!url.endsWith('.ts')) return new Worker(new URL(url), options);
	const boot = `import('tsx/esm/api').then(({ register }) => { register(); return import(${JSON.stringify(url)}); });`;
	return new Worker(boot, { ...options, eval: true });
}

/** The rough word count for a read that gave none: the one made while it ran, or made now. */
function roughOf(markdown: string, outcome: Outcome): number {
	return (outcome.type === 'over-limit' ? outcome.rough : undefined) ?? roughSpokenWords(markdown);
}

function digest(text: string): string {
	return createHash('sha256').update(text).digest('base64');
}

let pool: ScriptReaderPool | null = null;
const thePool = () => (pool ??= new ScriptReaderPool());

/** Starts the first reader ahead of the first read (tests); resolves once the started ones are ready. */
export function startScriptReaders(): Promise<void> {
	return thePool().ready();
}

/** A script's Markdown as sanitised HTML, or the escaped plain text with a notice when it cannot be read within the limit. */
export function scriptHtml(markdown: string): Promise<string> {
	return thePool().html(markdown);
}

/** The spoken words of a script (rules in `$lib/script/timing`), or the rough count when it cannot be read within the limit. */
export function spokenWords(markdown: string): Promise<number> {
	return thePool().words(markdown);
}

/** A script's HTML and spoken words from one read (the live preview, a segment's page), each with its fallback. */
export function scriptHtmlAndWords(markdown: string): Promise<{ html: string; words: number }> {
	return thePool().both(markdown);
}

/** Spoken words of several scripts, in order. */
export function spokenWordsEach(markdowns: readonly string[]): Promise<number[]> {
	return Promise.all(markdowns.map((markdown) => thePool().words(markdown)));
}

/** How many script readers are started or starting now (for tests). */
export function scriptReaderCount(): number {
	return thePool().size;
}

/** Changes how long an unneeded reader stays after its last read (tests shorten it). */
export function keepIdleReadersFor(milliseconds: number): void {
	idleReaderLifeMs = milliseconds;
}

/** Changes how long the pool keeps its spare after the last read was asked for (tests shorten it). */
export function keepLastReaderFor(milliseconds: number): void {
	lastReaderLifeMs = milliseconds;
}
