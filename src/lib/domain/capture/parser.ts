/**
 * Streaming parser for voltage captures (time, signal) in CSV. The caller reads the file and
 * feeds text chunks; each sample goes to a callback at once and is not kept, so memory stays
 * bounded for captures of millions of samples. See docs/method.md, "Capture files".
 */
import {
	applyUnitsRow,
	isUnitsRow,
	planColumns,
	planHeaderless,
	TIME_UNIT_TO_S,
	type ColumnChoice,
	type ColumnPlan,
	type TimeUnit
} from './columns';
import { CsvRecordReader, detectSeparator, type CsvSeparator } from './csv-records';
import { parseDecimal } from './decimal';
import { CaptureParseError } from './parse-error';

export { CaptureParseError };

export interface CaptureParserOptions extends ColumnChoice {
	/** Called once per sample: time in s, signal in V. */
	onSample: (timeS: number, volts: number) => void;
	/** Field separator; detected from the first line when left out. */
	separator?: CsvSeparator;
	/**
	 * Accept a comma as decimal mark where it cannot be a separator (semicolon or tab files,
	 * or inside a quoted field). Default true.
	 */
	decimalComma?: boolean;
	/** Whether the first row is a header; detected when left out (a row of numbers is data). */
	hasHeader?: boolean;
}

/** What the parser found, returned by `end()`. */
export interface CaptureParseInfo {
	sampleCount: number;
	firstTimeS: number;
	lastTimeS: number;
	separator: CsvSeparator;
	hasHeader: boolean;
	timeColumn: string;
	voltsColumn: string;
	timeUnit: TimeUnit;
	/** Lines read, including header and blank lines. */
	lineCount: number;
}

export interface CaptureParser {
	/** Feeds the next piece of text; pieces may split lines and quoted fields anywhere. */
	push(chunk: string): void;
	/** Finishes the file; throws CaptureParseError for an empty file or one without samples. */
	end(): CaptureParseInfo;
}

/** Creates a chunk-fed capture parser; samples go to `options.onSample`. */
export function createCaptureParser(options: CaptureParserOptions): CaptureParser {
	const decimalComma = options.decimalComma ?? true;
	const onSample = options.onSample;
	let reader: CsvRecordReader | undefined;
	let separator: CsvSeparator = options.separator ?? ',';
	let head = '';
	let started = false;
	let plan: ColumnPlan | undefined;
	let hasHeader = false;
	let headerLine = 0;
	let expectUnitsRow = false;
	let timeMultiply = 1;
	let timeDivide = 1;
	let voltsScale = 1;
	let needed = 0;
	let timeIndex = 0;
	let voltsIndex = 1;
	/** Columns a data row may fill: the header's width (or the first row's, without one). */
	let width = 0;
	let count = 0;
	let firstTimeS = NaN;
	let lastRaw = -Infinity;
	let lastLine = 0;

	const readNumber = (
		field: string | undefined,
		line: number,
		column: number,
		what: string
	): number => {
		if (field === undefined) {
			throw new CaptureParseError(
				line,
				column,
				`expected a number for ${what}, found the end of the line`
			);
		}
		const trimmed = field.trim();
		const value = parseDecimal(trimmed, 0, trimmed.length, decimalComma);
		if (!Number.isNaN(value)) return value;
		const shown = trimmed === '' ? 'an empty field' : `"${trimmed}"`;
		throw new CaptureParseError(line, column, `expected a number for ${what}, found ${shown}`);
	};

	const isNumber = (field: string): boolean => {
		const trimmed = field.trim();
		return !Number.isNaN(parseDecimal(trimmed, 0, trimmed.length, decimalComma));
	};

	const setPlan = (next: ColumnPlan): void => {
		plan = next;
		const time = TIME_UNIT_TO_S[next.timeUnit];
		timeMultiply = time.multiply;
		timeDivide = time.divide;
		voltsScale = next.signalUnit === 'mV' ? 0.001 : 1;
		needed = Math.max(next.timeIndex, next.voltsIndex) + 1;
		timeIndex = next.timeIndex;
		voltsIndex = next.voltsIndex;
	};

	const onRecord = (fields: string[], line: number): void => {
		if (fields.length === 1 && fields[0].trim() === '') return;
		if (plan === undefined) {
			const looksNumeric = fields.every((f) => f.trim() === '' || isNumber(f));
			hasHeader = options.hasHeader ?? !looksNumeric;
			width = fields.length;
			if (hasHeader) {
				setPlan(planColumns(fields, line, options));
				headerLine = line;
				expectUnitsRow = true;
				return;
			}
			setPlan(planHeaderless(options, line));
		} else if (expectUnitsRow) {
			expectUnitsRow = false;
			if (isUnitsRow(fields)) {
				setPlan(applyUnitsRow(plan, fields, line, options));
				return;
			}
		}
		const p = plan as ColumnPlan;
		// A row of empty fields (";;" from a spreadsheet) is a blank line
		if ((fields[p.timeIndex] ?? '').trim() === '' && fields.every((f) => f.trim() === '')) return;
		if (fields.length > width && fields.slice(width).some((f) => f.trim() !== '')) {
			const hint =
				separator === ','
					? '; a comma used as decimal mark needs a semicolon or tab between columns'
					: '';
			throw new CaptureParseError(
				line,
				width + 1,
				`expected ${width} columns as in the ${hasHeader ? 'header' : 'first row'}, found ${fields.length}${hint}`
			);
		}
		if (fields.length < needed) {
			const column = fields.length + 1;
			const what = column === p.timeIndex + 1 ? 'time' : 'volts';
			throw new CaptureParseError(
				line,
				column,
				`expected a number for ${what}, found the end of the line (the row has ${fields.length} of ${needed} columns)`
			);
		}
		const rawTime = readNumber(fields[p.timeIndex], line, p.timeIndex + 1, 'time');
		const rawVolts = readNumber(fields[p.voltsIndex], line, p.voltsIndex + 1, 'volts');
		if (rawTime < lastRaw) {
			throw new CaptureParseError(
				line,
				p.timeIndex + 1,
				`expected time to keep rising, found ${fields[p.timeIndex].trim()} ${p.timeUnit} after ` +
					`${lastRaw} ${p.timeUnit} on line ${lastLine}; time must not go backwards`
			);
		}
		acceptSample(rawTime, rawVolts, line);
	};

	const acceptSample = (rawTime: number, rawVolts: number, line: number): void => {
		lastRaw = rawTime;
		lastLine = line;
		const timeS = (rawTime * timeMultiply) / timeDivide;
		if (count === 0) firstTimeS = timeS;
		count += 1;
		onSample(timeS, rawVolts * voltsScale);
	};

	/**
	 * Hot path for a line without quotes once the columns are known: finds the two fields by
	 * separator position and reads the numbers in place. Anything unusual (blank, short or
	 * long rows, bad numbers, time going back) goes to `onRecord`, which owns the messages.
	 */
	const onLine = (text: string, start: number, end: number, line: number): void => {
		if (plan === undefined || expectUnitsRow) {
			if (start < end) onRecord(text.slice(start, end).split(separator), line);
			return;
		}
		if (start === end) return;
		let timeStart = -1;
		let timeEnd = -1;
		let voltsStart = -1;
		let voltsEnd = -1;
		let fieldStart = start;
		for (let index = 0; index < width; index++) {
			if (fieldStart > end) break;
			let fieldEnd = text.indexOf(separator, fieldStart);
			if (fieldEnd < 0 || fieldEnd > end) fieldEnd = end;
			if (index === timeIndex) {
				timeStart = fieldStart;
				timeEnd = fieldEnd;
			}
			if (index === voltsIndex) {
				voltsStart = fieldStart;
				voltsEnd = fieldEnd;
			}
			fieldStart = fieldEnd + 1;
		}
		// Text past the last column (other than empty trailing fields) needs the full check
		for (let i = fieldStart; i < end; i++) {
			const c = text.charCodeAt(i);
			if (c !== 32 && text[i] !== separator) {
				onRecord(text.slice(start, end).split(separator), line);
				return;
			}
		}
		const rawTime = timeStart < 0 ? NaN : parseDecimal(text, timeStart, timeEnd, decimalComma);
		const rawVolts = voltsStart < 0 ? NaN : parseDecimal(text, voltsStart, voltsEnd, decimalComma);
		if (Number.isNaN(rawTime) || Number.isNaN(rawVolts) || rawTime < lastRaw) {
			onRecord(text.slice(start, end).split(separator), line);
			return;
		}
		acceptSample(rawTime, rawVolts, line);
	};

	const startReader = (firstLine: string): CsvRecordReader => {
		separator = options.separator ?? detectSeparator(firstLine);
		reader = new CsvRecordReader(separator, onRecord, onLine);
		return reader;
	};

	return {
		push(chunk: string): void {
			if (chunk.length === 0) return;
			if (reader) {
				reader.push(chunk);
				return;
			}
			head += chunk;
			if (!started && head.charCodeAt(0) === 0xfeff) head = head.slice(1);
			started = true;
			const newline = head.indexOf('\n');
			if (newline < 0) return;
			const text = head;
			head = '';
			startReader(text.slice(0, newline)).push(text);
		},
		end(): CaptureParseInfo {
			if (!reader) {
				if (head.trim() === '') {
					throw new CaptureParseError(
						1,
						1,
						'the file is empty: expected a header such as "time,volts" followed by samples'
					);
				}
				const text = head;
				head = '';
				startReader(text).push(text);
			}
			const r = reader as CsvRecordReader;
			r.end();
			const lineCount = r.line - 1;
			if (plan === undefined) {
				throw new CaptureParseError(
					1,
					1,
					'the file is empty: expected a header such as "time,volts" followed by samples'
				);
			}
			if (count === 0) {
				throw new CaptureParseError(
					Math.max(headerLine, lineCount) + 1,
					1,
					'expected samples after the header, found the end of the file'
				);
			}
			return {
				sampleCount: count,
				firstTimeS,
				lastTimeS: (lastRaw * timeMultiply) / timeDivide,
				separator,
				hasHeader,
				timeColumn: plan.timeName,
				voltsColumn: plan.voltsName,
				timeUnit: plan.timeUnit,
				lineCount
			};
		}
	};
}

/** Parses a whole capture held in a string (small files and tests). */
export function parseCaptureText(
	text: string,
	options: Omit<CaptureParserOptions, 'onSample'> = {}
): { timesS: number[]; volts: number[]; info: CaptureParseInfo } {
	const timesS: number[] = [];
	const volts: number[] = [];
	const parser = createCaptureParser({
		...options,
		onSample: (t, v) => {
			timesS.push(t);
			volts.push(v);
		}
	});
	parser.push(text);
	return { timesS, volts, info: parser.end() };
}
