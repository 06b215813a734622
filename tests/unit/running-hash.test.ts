/**
 * The SHA-256 taken while an upload's bytes arrive (upload-store.ts writing, running-hash.ts
 * hashing) against outside references: the FIPS 180-4 example for "abc" and
 * coreutils' `sha256sum` over the file on disk. The running hash must equal the file's whenever it
 * answers, and answer nothing (so completion hashes the file) when it did not see every byte.
 */
import { execFileSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import { afterAll, describe, expect, test } from 'vitest';
import { HashingFileStore } from '../../src/lib/server/footage/upload-store.ts';
import { uploadHashes } from '../../src/lib/server/footage/running-hash.ts';

const directory = mkdtempSync(path.join(tmpdir(), 'wrenchroll-running-hash-'));
const store = new HashingFileStore({ directory });
afterAll(() => rmSync(directory, { recursive: true, force: true }));

let uploads = 0;
/** A new empty upload file, as tus's creation leaves it. */
function newUpload(): string {
	const id = `upload${++uploads}`;
	writeFileSync(path.join(directory, id), '');
	return id;
}

/** Writes `bytes` at `offset` as a request body would arrive: in pieces of `piece` bytes. */
function write(id: string, offset: number, bytes: Buffer, piece = 64 * 1024): Promise<number> {
	const pieces: Buffer[] = [];
	for (let at = 0; at < bytes.length; at += piece) pieces.push(bytes.subarray(at, at + piece));
	return store.write(Readable.from(pieces), id, offset);
}

/** coreutils' sha256sum over the stored file. */
const sha256sum = (id: string) =>
	execFileSync('sha256sum', [path.join(directory, id)], { encoding: 'utf8' }).split(' ')[0];

describe('running SHA-256 of an upload', () => {
	test('"abc" sent in two requests hashes to the FIPS 180-4 example', async () => {
		const id = newUpload();
		expect(await write(id, 0, Buffer.from('a'))).toBe(1);
		expect(await write(id, 1, Buffer.from('bc'), 1)).toBe(3);
		// FIPS 180-4 worked example (NIST "SHA-256 example", one-block message "abc"); the digest is
		// written from memory of that example (tests/REFERENCES.md, "Resumable uploads").
		expect(await uploadHashes.digest(id, 3)).toBe(
			'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad'
		);
	});

	test('megabytes in three requests of uneven pieces hash as sha256sum hashes the stored file', async () => {
		const id = newUpload();
		const bytes = randomBytes(5 * 1024 * 1024 + 123);
		const cuts = [0, 1_700_001, 3_900_000, bytes.length];
		for (let part = 0; part < 3; part++) {
			const offset = await write(
				id,
				cuts[part],
				bytes.subarray(cuts[part], cuts[part + 1]),
				65_443
			);
			expect(offset).toBe(cuts[part + 1]);
		}
		expect(readFileSync(path.join(directory, id)).equals(bytes)).toBe(true);
		expect(await uploadHashes.digest(id, bytes.length)).toBe(sha256sum(id));
	});

	test('a request that resumes from another offset than the hash reached gives no running hash', async () => {
		const id = newUpload();
		await write(id, 0, Buffer.from('lug nuts'));
		// As after a restart that lost the last bytes: the next request starts earlier.
		await write(id, 4, Buffer.from(' bolts'));
		expect(await uploadHashes.digest(id, 10)).toBeNull();
	});

	test('a request whose body breaks off gives no running hash, and the bytes written stay', async () => {
		const id = newUpload();
		const broken = new Readable({
			read() {
				this.push(Buffer.from('torque spec '));
				this.destroy(new Error('the client went away'));
			}
		});
		await expect(store.write(broken, id, 0)).rejects.toBeDefined();
		expect(uploadHashes.seen(id)).toBeUndefined();
		expect(await uploadHashes.digest(id, readFileSync(path.join(directory, id)).length)).toBeNull();
	});

	test('a write the disk refuses gives no running hash, though the bytes were hashed as it ran', async () => {
		// The bytes are hashed while the write runs; a refused write must drop that hash. Linux's
		// /dev/full refuses every write with ENOSPC (the full(4) manual page), like a full disk.
		const id = `upload${++uploads}`;
		symlinkSync('/dev/full', path.join(directory, id));
		await expect(write(id, 0, randomBytes(3 * 64 * 1024))).rejects.toBeDefined();
		expect(uploadHashes.seen(id)).toBeUndefined();
		expect(await uploadHashes.digest(id, 3 * 64 * 1024)).toBeNull();
	});
});
