/**
 * The one place uploaded files are kept. Callers speak in keys ("org-12/2025/abc….csv"), never
 * in paths, so the local folder (the default, STORAGE_DIR) can later be swapped for object
 * storage behind the same functions. Writes stream: a file is hashed (SHA-256), measured and
 * sniffed while it passes through, and lands under its key only when complete.
 */
import { createHash, randomUUID } from 'node:crypto';
import { createReadStream, createWriteStream } from 'node:fs';
import { mkdir, open, rename, rm, stat } from 'node:fs/promises';
import path from 'node:path';
import { once } from 'node:events';
import type { Readable } from 'node:stream';
import { config } from '../config';
import { sniffContent, type Sniffed } from './sniff';

/** What a finished write measured. */
export interface StoredFile {
	key: string;
	sizeBytes: number;
	sha256: string;
	sniffed: Sniffed;
}

/** Thrown while writing when a file passes its size limit; nothing is kept. */
export class FileTooLargeError extends Error {
	constructor(readonly limitBytes: number) {
		super(`The file is larger than the ${formatBytes(limitBytes)} allowed.`);
		this.name = 'FileTooLargeError';
	}
}

const SNIFF_BYTES = 8192;

export function formatBytes(bytes: number): string {
	if (bytes >= 1024 * 1024)
		return `${(bytes / (1024 * 1024)).toFixed(bytes % (1024 * 1024) === 0 ? 0 : 1)} MB`;
	if (bytes >= 1024) return `${Math.round(bytes / 1024)} KB`;
	return `${bytes} bytes`;
}

function root(): string {
	return path.resolve(config.STORAGE_DIR);
}

/** Absolute path of a key; refuses keys that would step outside the storage folder. */
function pathOf(key: string): string {
	if (!/^[a-z0-9][a-z0-9/_.-]*$/i.test(key) || key.includes('..'))
		throw new Error(`Bad storage key "${key}"`);
	return path.join(root(), key);
}

/** A fresh key for an organisation's file, e.g. "org-3/2025-06/5d1c….csv". */
export function newKey(organisationId: number, extension: string, now = new Date()): string {
	const month = now.toISOString().slice(0, 7);
	return `org-${organisationId}/${month}/${randomUUID()}.${extension.replace(/[^a-z0-9]/gi, '') || 'bin'}`;
}

/**
 * A streaming writer: feed chunks with `write`, then `finish` (or `abort`). Backpressure is
 * respected, so memory stays at a chunk or two whatever the file's size.
 */
export interface FileWriter {
	write(chunk: Uint8Array): Promise<void>;
	/** Bytes written so far. */
	readonly sizeBytes: number;
	/** The sniffed type once at least 8 KiB (or the whole file) has passed. */
	readonly sniffed: Sniffed | null;
	finish(): Promise<StoredFile>;
	abort(): Promise<void>;
}

export async function createFileWriter(
	key: string,
	options: { maxBytes: number }
): Promise<FileWriter> {
	const finalPath = pathOf(key);
	await mkdir(path.dirname(finalPath), { recursive: true });
	const tempPath = `${finalPath}.part-${randomUUID().slice(0, 8)}`;
	const out = createWriteStream(tempPath);
	const hash = createHash('sha256');
	let size = 0;
	let head: Uint8Array = new Uint8Array(0);
	let sniffed: Sniffed | null = null;
	let closed = false;
	const failed = new Promise<never>((_, reject) => out.once('error', reject));
	failed.catch(() => undefined);

	const close = async () => {
		if (closed) return;
		closed = true;
		out.end();
		await Promise.race([once(out, 'close'), failed]);
	};
	const abort = async () => {
		if (!closed) {
			closed = true;
			out.destroy();
		}
		// The file is opened asynchronously: removing it before the stream has closed could let a
		// late open create it again, leaving a stray partial file behind.
		if (!out.closed) await new Promise<void>((resolve) => out.once('close', () => resolve()));
		await rm(tempPath, { force: true });
	};

	return {
		get sizeBytes() {
			return size;
		},
		get sniffed() {
			return sniffed;
		},
		async write(chunk: Uint8Array) {
			if (closed) throw new Error('Write after the file was closed');
			size += chunk.byteLength;
			if (size > options.maxBytes) {
				await abort();
				throw new FileTooLargeError(options.maxBytes);
			}
			if (sniffed === null) {
				const joined = new Uint8Array(head.length + chunk.byteLength);
				joined.set(head);
				joined.set(chunk, head.length);
				head = joined.subarray(0, SNIFF_BYTES);
				if (head.length >= SNIFF_BYTES) sniffed = sniffContent(head);
			}
			hash.update(chunk);
			if (!out.write(chunk)) await Promise.race([once(out, 'drain'), failed]);
		},
		async finish() {
			sniffed ??= sniffContent(head, true);
			await close();
			await rename(tempPath, finalPath);
			return { key, sizeBytes: size, sha256: hash.digest('hex'), sniffed };
		},
		abort
	};
}

/** Writes a whole buffer under a key (derived files such as a capture's chart trace). */
export async function writeBuffer(key: string, data: Uint8Array): Promise<StoredFile> {
	const writer = await createFileWriter(key, { maxBytes: Number.MAX_SAFE_INTEGER });
	await writer.write(data);
	return writer.finish();
}

/** A stream of a stored file, optionally of bytes [start, end] (inclusive, as in fs). */
export function openRead(key: string, range?: { start: number; end: number }): Readable {
	return createReadStream(pathOf(key), range ? { start: range.start, end: range.end } : {});
}

/** Reads `length` bytes at `position` (fewer at the end of the file). */
export async function readRange(key: string, position: number, length: number): Promise<Buffer> {
	const handle = await open(pathOf(key), 'r');
	try {
		const buffer = Buffer.alloc(length);
		const { bytesRead } = await handle.read(buffer, 0, length, position);
		return buffer.subarray(0, bytesRead);
	} finally {
		await handle.close();
	}
}

export async function sizeOf(key: string): Promise<number> {
	return (await stat(pathOf(key))).size;
}

export async function removeFile(key: string): Promise<void> {
	await rm(pathOf(key), { force: true });
}

/**
 * The chunks of an incoming file; if the stream breaks (a body cut off, the client gone), the
 * partly written file is removed before the error goes on, so nothing half-stored remains.
 */
export async function* removingOnBreak(
	body: AsyncIterable<Uint8Array>,
	writer: FileWriter
): AsyncGenerator<Uint8Array> {
	try {
		for await (const chunk of body) yield chunk;
	} catch (err) {
		await writer.abort();
		throw err;
	}
}
