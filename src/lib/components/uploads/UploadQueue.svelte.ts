/**
 * The browser side of resumable uploads: one tus-js-client Upload per file, with speed and time
 * left, pause and resume, and resume after a page reload (tus-js-client keeps each upload's URL in
 * localStorage under the file's fingerprint; re-adding the same file continues where it stopped).
 */
import * as tus from 'tus-js-client';
import { UPLOAD_CHUNK_BYTES, UPLOAD_PATH } from '$lib/upload-rules';

export type UploadState = 'waiting' | 'uploading' | 'paused' | 'finishing' | 'done' | 'failed';

export interface QueuedFile {
	key: string;
	name: string;
	size: number;
	sent: number;
	state: UploadState;
	bytesPerSecond: number;
	resumedFrom: number;
	error: string | null;
}

export interface UploadFields {
	episodeId: string;
	purpose: 'footage' | 'cut';
	shootDayId?: string;
	cameraLabel?: string;
	/** A cut upload's change note: what is new in this version. */
	changeNote?: string;
}

export class UploadQueue {
	files = $state<QueuedFile[]>([]);
	// Bookkeeping the page never renders, so plain (non-reactive) collections on purpose.
	// eslint-disable-next-line svelte/prefer-svelte-reactivity
	private uploads = new Map<string, tus.Upload>();
	// eslint-disable-next-line svelte/prefer-svelte-reactivity
	private samples = new Map<string, { at: number; sent: number }[]>();
	// eslint-disable-next-line svelte/prefer-svelte-reactivity
	private patched = new Set<string>();

	constructor(private onFinished: () => void) {}

	async add(file: File, fields: UploadFields) {
		const key = `${file.name}-${file.size}-${file.lastModified}-${crypto.randomUUID()}`;
		const entry: QueuedFile = { key, name: file.name, size: file.size, sent: 0, state: 'waiting', bytesPerSecond: 0, resumedFrom: 0, error: null };
		this.files.push(entry);
		const metadata: Record<string, string> = { filename: file.name, filetype: file.type || 'application/octet-stream', episodeId: fields.episodeId, purpose: fields.purpose };
		if (fields.shootDayId) metadata.shootDayId = fields.shootDayId;
		if (fields.cameraLabel) metadata.cameraLabel = fields.cameraLabel;
		if (fields.changeNote) metadata.changeNote = fields.changeNote;
		const upload = new tus.Upload(file, {
			endpoint: UPLOAD_PATH,
			chunkSize: UPLOAD_CHUNK_BYTES,
			retryDelays: [0, 1000, 3000, 5000, 10000, 20000],
			// A full storage quota (413) or upload disk (507) is not fixed by trying again in a few seconds.
			onShouldRetry: (error, attempt, options) => {
				const status = error.originalResponse?.getStatus();
				return status !== 413 && status !== 507 && (tus.defaultOptions.onShouldRetry?.(error, attempt, options) ?? false);
			},
			removeFingerprintOnSuccess: true,
			metadata,
			onProgress: (sent) => this.progress(key, sent),
			onBeforeRequest: (request) => {
				// The first PATCH of this page's upload names the offset the server already held.
				if (request.getMethod() !== 'PATCH' || this.patched.has(key)) return;
				this.patched.add(key);
				const offset = Number(request.getHeader('Upload-Offset'));
				if (offset > 0) this.update(key, { resumedFrom: offset });
			},
			onError: (error) => this.update(key, { state: 'failed', error: errorText(error) }),
			onSuccess: () => {
				this.update(key, { state: 'done', sent: file.size });
				this.onFinished();
			}
		});
		this.uploads.set(key, upload);
		const previous = await upload.findPreviousUploads();
		if (previous.length > 0) {
			upload.resumeFromPreviousUpload(previous[0]);
		}
		this.start(key);
	}

	start(key: string) {
		this.update(key, { state: 'uploading', error: null });
		this.samples.set(key, []);
		this.uploads.get(key)?.start();
	}

	async pause(key: string) {
		await this.uploads.get(key)?.abort();
		this.update(key, { state: 'paused', bytesPerSecond: 0 });
	}

	async cancel(key: string) {
		await this.uploads.get(key)?.abort(true); // terminates the upload on the server too
		this.uploads.delete(key);
		this.files = this.files.filter((f) => f.key !== key);
	}

	private progress(key: string, sent: number) {
		const now = performance.now();
		const samples = this.samples.get(key) ?? [];
		samples.push({ at: now, sent });
		while (samples.length > 2 && now - samples[0].at > 5000) samples.shift(); // a five-second window
		const first = samples[0];
		const bytesPerSecond = samples.length > 1 && now > first.at ? ((sent - first.sent) * 1000) / (now - first.at) : 0;
		const file = this.files.find((f) => f.key === key);
		this.update(key, { sent, bytesPerSecond, state: file && sent >= file.size ? 'finishing' : 'uploading' });
	}

	private update(key: string, change: Partial<QueuedFile>) {
		const index = this.files.findIndex((f) => f.key === key);
		if (index >= 0) this.files[index] = { ...this.files[index], ...change };
	}
}

/** Uploads this browser started and did not finish, so the page can ask for the file again. */
export async function unfinishedUploads(episodeId: string): Promise<{ name: string; size: number; createdAt: string }[]> {
	const all = await tus.defaultOptions.urlStorage.findAllUploads();
	return all
		.filter((entry) => (entry.metadata as Record<string, string> | undefined)?.episodeId === episodeId)
		.map((entry) => ({ name: (entry.metadata as Record<string, string>).filename ?? 'file', size: entry.size ?? 0, createdAt: String(entry.creationTime ?? '') }));
}

function errorText(error: Error): string {
	const detail = 'originalResponse' in error ? (error as tus.DetailedError).originalResponse?.getBody() : null;
	return detail?.trim() || 'The connection dropped. Press resume to continue from where it stopped.';
}
