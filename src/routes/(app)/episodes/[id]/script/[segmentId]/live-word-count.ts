/**
 * The editor's live word count, counted off the page's thread: each text goes to a Web Worker
 * (`spoken-words.worker.ts`); while one is being counted only the newest typed text waits, so a
 * fast typist never queues work. A count that takes longer than SCRIPT_READ_LIMIT_MS ends the
 * worker (the only way to stop `marked` mid-run) and shows the rough count, worked out on the page
 * in one linear pass; the next text gets a fresh worker.
 */
import { SCRIPT_READ_LIMIT_MS, roughSpokenWords } from '$lib/script/timing';
import type { SpokenWordsMessage } from './spoken-words.worker';

export interface LiveCount {
	words: number;
	/** True when this is the rough count because the exact one ran over the time limit. */
	rough: boolean;
}

/** A worker that has not said "ready" by then is not coming: count roughly on the page from then on. */
const START_LIMIT_MS = 10_000;

export class LiveWordCount {
	#create: () => Worker;
	#report: (count: LiveCount) => void;
	#worker: Worker | null = null;
	#ready = false;
	#broken = false;
	#startTimer: ReturnType<typeof setTimeout> | undefined;
	#running: { id: number; markdown: string; timer: ReturnType<typeof setTimeout> } | null = null;
	#waiting: string | null = null;
	#nextId = 1;

	constructor(create: () => Worker, report: (count: LiveCount) => void) {
		this.#create = create;
		this.#report = report;
	}

	/** Counts this text (soon); a text sent while another is being counted replaces any still waiting. */
	count(markdown: string): void {
		this.#waiting = markdown;
		this.#next();
	}

	stop(): void {
		this.#waiting = null;
		if (this.#running) clearTimeout(this.#running.timer);
		this.#running = null;
		this.#end();
	}

	#next(): void {
		if (this.#running || this.#waiting === null) return;
		if (this.#broken) {
			this.#report({ words: roughSpokenWords(this.#waiting), rough: true });
			this.#waiting = null;
			return;
		}
		if (!this.#worker) this.#start();
		if (!this.#ready || !this.#worker) return;
		const markdown = this.#waiting;
		this.#waiting = null;
		const id = this.#nextId++;
		const timer = setTimeout(() => this.#overrun(), SCRIPT_READ_LIMIT_MS);
		this.#running = { id, markdown, timer };
		this.#worker.postMessage({ id, markdown });
	}

	#start(): void {
		let worker: Worker;
		try {
			worker = this.#create();
		} catch {
			this.#giveUp();
			return;
		}
		this.#worker = worker;
		this.#ready = false;
		this.#startTimer = setTimeout(() => this.#giveUp(), START_LIMIT_MS);
		worker.onmessage = (event: MessageEvent<SpokenWordsMessage>) => {
			const message = event.data;
			if (message.type === 'ready') {
				clearTimeout(this.#startTimer);
				this.#ready = true;
				this.#next();
				return;
			}
			const running = this.#running;
			if (!running || running.id !== message.id) return;
			clearTimeout(running.timer);
			this.#running = null;
			this.#report(
				message.words === null
					? { words: roughSpokenWords(running.markdown), rough: true }
					: { words: message.words, rough: false }
			);
			this.#next();
		};
		worker.onerror = () => (this.#ready ? this.#overrun() : this.#giveUp());
	}

	#overrun(): void {
		const running = this.#running;
		this.#running = null;
		this.#end();
		if (running) {
			clearTimeout(running.timer);
			this.#report({ words: roughSpokenWords(running.markdown), rough: true });
		}
		this.#next();
	}

	#giveUp(): void {
		this.#broken = true;
		this.#overrun();
	}

	#end(): void {
		clearTimeout(this.#startTimer);
		this.#worker?.terminate();
		this.#worker = null;
		this.#ready = false;
	}
}
