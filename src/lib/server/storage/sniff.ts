/**
 * What a file really is, judged by its first bytes rather than its name: people rename
 * workbooks and PDFs to .csv. Known binary signatures are named so the message can say what
 * to do; anything else with NUL bytes or many control characters is binary; text is read as
 * UTF-8, or as Windows-1252 when it is not valid UTF-8 (older spreadsheet exports).
 */
import type { AttachmentMediaType } from '../../attachments';

export type Sniffed =
	| { kind: 'empty' }
	| { kind: 'binary'; looksLike: string | null }
	| { kind: 'text'; encoding: 'utf-8' | 'windows-1252' | 'utf-16' };

/** Leading bytes of common binary formats and what to call them in a message. */
const SIGNATURES: { bytes: number[]; name: string }[] = [
	{
		bytes: [0x50, 0x4b, 0x03, 0x04],
		name: 'a ZIP archive or an Excel/OpenDocument workbook (.xlsx, .ods)'
	},
	{ bytes: [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1], name: 'an old Excel workbook (.xls)' },
	{ bytes: [0x25, 0x50, 0x44, 0x46], name: 'a PDF document' },
	{ bytes: [0x89, 0x50, 0x4e, 0x47], name: 'a PNG image' },
	{ bytes: [0xff, 0xd8, 0xff], name: 'a JPEG image' },
	{ bytes: [0x47, 0x49, 0x46, 0x38], name: 'a GIF image' },
	{ bytes: [0x1f, 0x8b], name: 'a gzip archive' },
	{ bytes: [0x37, 0x7a, 0xbc, 0xaf, 0x27, 0x1c], name: 'a 7-Zip archive' },
	{ bytes: [0x52, 0x61, 0x72, 0x21], name: 'a RAR archive' },
	{ bytes: [0x53, 0x51, 0x4c, 0x69, 0x74, 0x65], name: 'an SQLite database' }
];

function startsWith(head: Uint8Array, bytes: number[]): boolean {
	return head.length >= bytes.length && bytes.every((b, i) => head[i] === b);
}

/** Length of `head` without a UTF-8 sequence cut off at its end. */
function completeUtf8Length(head: Uint8Array): number {
	let end = head.length;
	for (let back = 1; back <= 3 && end - back >= 0; back++) {
		const byte = head[end - back];
		if ((byte & 0xc0) === 0x80) continue; // continuation byte: keep looking for the lead
		if (byte >= 0xc0) {
			const need = byte >= 0xf0 ? 4 : byte >= 0xe0 ? 3 : 2;
			if (back < need) end -= back;
		}
		break;
	}
	return end;
}

/**
 * Judges the first bytes of a file (8 KiB is plenty).
 * @param head the file's first bytes; `atEnd` says whether they are the whole file
 */
export function sniffContent(head: Uint8Array, atEnd = false): Sniffed {
	if (head.length === 0) return { kind: 'empty' };
	for (const signature of SIGNATURES) {
		if (startsWith(head, signature.bytes)) return { kind: 'binary', looksLike: signature.name };
	}
	// A UTF-16 byte-order mark: text, but not in an encoding we read
	if (startsWith(head, [0xff, 0xfe]) || startsWith(head, [0xfe, 0xff]))
		return { kind: 'text', encoding: 'utf-16' };
	let control = 0;
	for (const byte of head) {
		if (byte === 0) return { kind: 'binary', looksLike: null };
		// Tab, line feed, carriage return and form feed are ordinary in text files
		if (byte < 0x20 && byte !== 0x09 && byte !== 0x0a && byte !== 0x0d && byte !== 0x0c)
			control += 1;
	}
	if (control > Math.max(2, head.length * 0.01)) return { kind: 'binary', looksLike: null };
	const length = atEnd ? head.length : completeUtf8Length(head);
	try {
		new TextDecoder('utf-8', { fatal: true }).decode(head.subarray(0, length));
		return { kind: 'text', encoding: 'utf-8' };
	} catch {
		return { kind: 'text', encoding: 'windows-1252' };
	}
}

/** Leading bytes of the attachment formats a report accepts. */
const MEDIA_SIGNATURES: { type: AttachmentMediaType; test: (head: Uint8Array) => boolean }[] = [
	{ type: 'image/jpeg', test: (h) => startsWith(h, [0xff, 0xd8, 0xff]) },
	{
		type: 'image/png',
		test: (h) => startsWith(h, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])
	},
	// A RIFF container ("RIFF", 4 size bytes) whose form type is "WEBP"
	{
		type: 'image/webp',
		test: (h) =>
			startsWith(h, [0x52, 0x49, 0x46, 0x46]) &&
			h.length >= 12 &&
			[0x57, 0x45, 0x42, 0x50].every((b, i) => h[8 + i] === b)
	},
	{ type: 'application/pdf', test: (h) => startsWith(h, [0x25, 0x50, 0x44, 0x46, 0x2d]) }
];

/** Bytes `sniffMediaType` needs to decide. */
export const MEDIA_SNIFF_BYTES = 12;

/** The photo or PDF type the file's first bytes show, or null for anything else. */
export function sniffMediaType(head: Uint8Array): AttachmentMediaType | null {
	return MEDIA_SIGNATURES.find((s) => s.test(head))?.type ?? null;
}

/** The message for a file that is not CSV text, or null when it is fine. */
export function notTextMessage(sniffed: Sniffed, fileName: string): string | null {
	if (sniffed.kind === 'empty') return `“${fileName}” is empty: there is nothing to read.`;
	if (sniffed.kind === 'binary') {
		const what = sniffed.looksLike ? `it looks like ${sniffed.looksLike}` : 'it holds binary data';
		return `“${fileName}” is not a text (CSV) file: ${what}. Open it in its program and save or export it as CSV, then upload that file.`;
	}
	if (sniffed.encoding === 'utf-16') {
		return `“${fileName}” is saved as UTF-16 (“Unicode text”). Save it as “CSV UTF-8” and upload it again.`;
	}
	return null;
}
