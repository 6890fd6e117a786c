/**
 * Splits CSV text fed in chunks into records (RFC 4180): fields separated by one character,
 * records by CRLF or LF, fields optionally in double quotes with "" for a quote inside, and
 * quoted fields may span lines. Only the unfinished tail of the last chunk is kept.
 */
import { CaptureParseError } from './parse-error';

export type CsvSeparator = ',' | ';' | '\t';

/** Receives each record's fields and the 1-based line the record starts on. */
export type RecordHandler = (fields: string[], line: number) => void;

/**
 * Optional fast path for a line without quotes: the text and the line's bounds, so the
 * caller can read fields in place instead of allocating them.
 */
export type LineHandler = (text: string, start: number, end: number, line: number) => void;

/**
 * Picks the separator from a header or first data line: a semicolon wins whenever present,
 * because semicolon files use the comma as decimal mark; then tab; else comma. Characters
 * inside quotes do not count.
 */
export function detectSeparator(firstLine: string): CsvSeparator {
	let inQuotes = false;
	let hasTab = false;
	for (let i = 0; i < firstLine.length; i++) {
		const c = firstLine[i];
		if (c === '"') inQuotes = !inQuotes;
		else if (!inQuotes && c === ';') return ';';
		else if (!inQuotes && c === '\t') hasTab = true;
	}
	return hasTab ? '\t' : ',';
}

/** Streaming record splitter; `push` chunks, then `end` once. */
export class CsvRecordReader {
	private readonly separator: CsvSeparator;
	private readonly onRecord: RecordHandler;
	private pending = '';
	private nextLine = 1;

	private readonly onLine: LineHandler | undefined;

	constructor(separator: CsvSeparator, onRecord: RecordHandler, onLine?: LineHandler) {
		this.separator = separator;
		this.onRecord = onRecord;
		this.onLine = onLine;
	}

	/** 1-based number of the line after the last complete record. */
	get line(): number {
		return this.nextLine;
	}

	push(chunk: string): void {
		let from = 0;
		if (this.pending.length > 0) {
			// Finish the carried-over line on its own, so the big chunk is scanned as the flat
			// string it arrived as rather than as a concatenation
			const newline = chunk.indexOf('\n');
			if (newline < 0) {
				this.pending += chunk;
				return;
			}
			const joined = this.pending + chunk.slice(0, newline + 1);
			const done = this.consume(joined, 0, false);
			if (done < joined.length) {
				// A quoted field runs on past this line: fall back to one joined text
				const text = joined.slice(done) + chunk.slice(newline + 1);
				this.pending = text.slice(this.consume(text, 0, false));
				return;
			}
			from = newline + 1;
		}
		this.pending = chunk.slice(this.consume(chunk, from, false));
	}

	end(): void {
		const text = this.pending;
		this.pending = '';
		if (text.length > 0) this.consume(text, 0, true);
	}

	/** Emits every complete record in `text`; returns where the unfinished tail begins. */
	private consume(text: string, from: number, isLast: boolean): number {
		let pos = from;
		const sep = this.separator;
		// Position of the next double quote, searched once and not again until passed
		let quote = -1;
		while (pos < text.length) {
			let newline = text.indexOf('\n', pos);
			if (newline < 0) {
				if (!isLast) return pos;
				newline = text.length;
			}
			if (quote < pos) {
				quote = text.indexOf('"', pos);
				if (quote < 0) quote = text.length;
			}
			if (quote < newline) {
				// Slow path: quoted fields may hold separators and line breaks
				let end = findRecordEnd(text, pos, sep.charCodeAt(0));
				if (end === OPEN_QUOTE || (end === NO_LINE_FEED && !isLast)) {
					if (!isLast) return pos;
					throw new CaptureParseError(
						this.nextLine,
						countSeparators(text, pos, quote, sep) + 1,
						'a quoted field is never closed: expected a closing double quote (")'
					);
				}
				if (end === NO_LINE_FEED) end = text.length;
				const recordEnd = end > pos && text[end - 1] === '\r' ? end - 1 : end;
				const fields = splitQuoted(text, pos, recordEnd, sep, this.nextLine);
				const line = this.nextLine;
				this.nextLine += countNewlines(text, pos, end) + 1;
				pos = end + 1;
				this.onRecord(fields, line);
				continue;
			}
			const lineEnd = newline > pos && text[newline - 1] === '\r' ? newline - 1 : newline;
			const line = this.nextLine;
			this.nextLine += 1;
			const lineStart = pos;
			pos = newline + 1;
			if (this.onLine) this.onLine(text, lineStart, lineEnd, line);
			else this.onRecord(text.slice(lineStart, lineEnd).split(sep), line);
		}
		return pos;
	}
}

const NO_LINE_FEED = -1;
const OPEN_QUOTE = -2;

/**
 * Index of the line feed ending the record that starts at `pos`; NO_LINE_FEED when the text
 * ends with quotes balanced, OPEN_QUOTE when it ends inside a quoted field. Only a quote at
 * the start of a field opens one; a stray quote mid-field is left for splitQuoted to report.
 */
function findRecordEnd(text: string, pos: number, sep: number): number {
	let inQuotes = false;
	let atFieldStart = true;
	for (let i = pos; i < text.length; i++) {
		const c = text.charCodeAt(i);
		if (inQuotes) {
			if (c === 34) {
				if (text.charCodeAt(i + 1) === 34) i++;
				else inQuotes = false;
			}
		} else if (c === 10) {
			return i;
		} else if (c === sep) {
			atFieldStart = true;
		} else if (c === 34 && atFieldStart) {
			inQuotes = true;
			atFieldStart = false;
		} else if (c !== 32) {
			atFieldStart = false;
		}
	}
	return inQuotes ? OPEN_QUOTE : NO_LINE_FEED;
}

/** Splits one record with quoted fields; spaces around a quoted field are tolerated. */
function splitQuoted(
	text: string,
	start: number,
	end: number,
	sep: string,
	line: number
): string[] {
	const fields: string[] = [];
	let i = start;
	for (;;) {
		const column = fields.length + 1;
		let j = i;
		while (j < end && text[j] === ' ') j++;
		if (j < end && text[j] === '"') {
			let value = '';
			let k = j + 1;
			for (;;) {
				const close = text.indexOf('"', k);
				if (close < 0 || close >= end) {
					throw new CaptureParseError(
						line,
						column,
						'a quoted field is never closed: expected a closing double quote (")'
					);
				}
				value += text.slice(k, close);
				if (text[close + 1] === '"' && close + 1 < end) {
					value += '"';
					k = close + 2;
				} else {
					k = close + 1;
					break;
				}
			}
			while (k < end && text[k] === ' ') k++;
			fields.push(value);
			if (k >= end) return fields;
			if (text[k] !== sep) {
				throw new CaptureParseError(
					line,
					column,
					`expected a separator (${describeSeparator(sep)}) after the closing quote, found "${text[k]}"`
				);
			}
			i = k + 1;
			continue;
		}
		const next = text.indexOf(sep, i);
		const fieldEnd = next < 0 || next >= end ? end : next;
		const value = text.slice(i, fieldEnd);
		if (value.includes('"')) {
			throw new CaptureParseError(
				line,
				column,
				`found a double quote inside an unquoted field ("${value}"); a field holding quotes must itself be quoted, with each quote doubled`
			);
		}
		fields.push(value);
		if (fieldEnd >= end) return fields;
		i = fieldEnd + 1;
	}
}

/** Names a separator for a message. */
export function describeSeparator(sep: string): string {
	return sep === '\t' ? 'a tab' : sep === ';' ? 'a semicolon' : 'a comma';
}

function countNewlines(text: string, from: number, to: number): number {
	let n = 0;
	for (let i = from; i < to; i++) if (text.charCodeAt(i) === 10) n++;
	return n;
}

function countSeparators(text: string, from: number, to: number, sep: string): number {
	let n = 0;
	for (let i = from; i < to; i++) if (text[i] === sep) n++;
	return n;
}
