import { Readable } from 'node:stream';
import busboy from 'busboy';
import { ValidationError } from '../services/errors';

/** What the sender is told when the form breaks off before its end (cut short, client gone). */
export const CUT_OFF_MESSAGE =
	'The upload was cut off before the end of the form arrived. Nothing was stored; please send the file again.';

const cutOff = () => new ValidationError(CUT_OFF_MESSAGE, { file: CUT_OFF_MESSAGE });

/**
 * Feeds the request body to busboy and resolves when the form has been read. Every parser or
 * stream error (a body ending mid-file, the client going away) becomes a ValidationError for
 * this request: an error event nobody listens to would take the whole server down.
 */
function pump(request: Request, parser: busboy.Busboy): Promise<void> {
	const finished = new Promise<void>((resolve, reject) => {
		parser.on('close', () => resolve());
		parser.on('error', () => reject(cutOff()));
	});
	const source = Readable.fromWeb(
		request.body as import('node:stream/web').ReadableStream<Uint8Array>
	);
	source.on('error', () => parser.destroy(cutOff()));
	source.pipe(parser);
	return finished;
}

/** Each file stream gets a listener at once: busboy destroys it with an error on a cut-off body. */
function guard(stream: NodeJS.ReadableStream): void {
	stream.on('error', () => undefined);
}

export interface IncomingFile {
	fileName: string;
	/** The file's bytes as they arrive; never held whole in memory. */
	body: AsyncIterable<Uint8Array>;
}

/**
 * Reads a multipart form post as a stream: the first file goes to `consume` while it arrives
 * (so a capture of tens of MB is never buffered), the small text fields are collected.
 * `consume` must read its stream to the end, even when it refuses the file.
 * @returns the text fields, and what `consume` returned (undefined when no file was sent)
 */
export async function readMultipart<T>(
	request: Request,
	consume: (file: IncomingFile, fieldsSoFar: Record<string, string>) => Promise<T>
): Promise<{ fields: Record<string, string>; result: T | undefined }> {
	const contentType = request.headers.get('content-type') ?? '';
	if (!contentType.toLowerCase().startsWith('multipart/form-data') || !request.body) {
		throw new ValidationError('Send the file as a form upload (multipart/form-data).', {
			file: 'Choose a file'
		});
	}
	const parser = busboy({
		headers: { 'content-type': contentType },
		limits: { files: 1, fields: 40, fieldSize: 64 * 1024 }
	});
	const fields: Record<string, string> = {};
	let work: Promise<T> | undefined;
	parser.on('field', (name, value) => {
		fields[name] = value;
	});
	parser.on('file', (_name, stream, info) => {
		guard(stream);
		if (work || !info.filename) {
			stream.resume();
			return;
		}
		work = consume({ fileName: info.filename, body: stream }, { ...fields });
		// If the consumer gave up early, keep the rest flowing so the form's other parts arrive
		work.catch(() => stream.resume());
	});
	try {
		await pump(request, parser);
	} catch (err) {
		// Let the consumer finish (and remove what it had written) before answering.
		await work?.catch(() => undefined);
		throw err;
	}
	return { fields, result: work ? await work : undefined };
}

/** Text fields of a form; a name sent several times (checkbox groups) gives an array. */
export type FormFields = Record<string, string | string[]>;

/**
 * Reads a form post that may carry several files, one after another as they arrive: each goes
 * to `consume` (never buffered whole). After the first refusal the remaining files are read
 * and dropped, so the answer still reaches the sender; the caller decides what to do with the
 * files already consumed. A urlencoded post (no file input) gives its fields and no files.
 */
export async function readFormWithFiles<T>(
	request: Request,
	consume: (file: IncomingFile) => Promise<T>,
	options: { maxFiles: number; tooMany: () => Error }
): Promise<{ fields: FormFields; results: T[]; failure: unknown }> {
	const fields: FormFields = {};
	const add = (name: string, value: string) => {
		const seen = fields[name];
		fields[name] = seen === undefined ? value : [...(Array.isArray(seen) ? seen : [seen]), value];
	};
	const contentType = request.headers.get('content-type') ?? '';
	if (!contentType.toLowerCase().startsWith('multipart/form-data') || !request.body) {
		for (const [name, value] of (await request.formData()).entries())
			if (typeof value === 'string') add(name, value);
		return { fields, results: [], failure: null };
	}
	const parser = busboy({
		headers: { 'content-type': contentType },
		limits: { files: options.maxFiles + 1, fields: 60, fieldSize: 64 * 1024 }
	});
	const results: T[] = [];
	let failure: unknown = null;
	let count = 0;
	let queue: Promise<void> = Promise.resolve();
	parser.on('field', add);
	parser.on('file', (_name, stream, { filename: fileName }) => {
		guard(stream);
		if (!fileName) {
			stream.resume(); // an empty file input
			return;
		}
		count += 1;
		if (count > options.maxFiles) failure ??= options.tooMany();
		queue = queue.then(async () => {
			if (failure) {
				stream.resume();
				return;
			}
			try {
				results.push(await consume({ fileName, body: stream }));
			} catch (err) {
				failure = err;
				stream.resume();
			}
		});
	});
	// A broken upload still lets the files already written be handed back for cleaning up
	await pump(request, parser).catch((err) => {
		failure ??= err;
	});
	await queue;
	return { fields, results, failure };
}
