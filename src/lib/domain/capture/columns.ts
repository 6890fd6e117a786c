/**
 * Reading a capture's header: which column holds time and which the signal, and their units.
 * Scope and logger exports name them many ways ("time", "Time (s)", "t_ms", "Zeit [ms]",
 * "volts", "Channel A (V)", "signal", "Spannung"…).
 */
import { CaptureParseError } from './parse-error';

export type TimeUnit = 's' | 'ms' | 'us' | 'min';
export type SignalUnit = 'V' | 'mV';

/** Seconds in one of each time unit; milli/micro divide so 3 ms gives exactly 0.003 s. */
export const TIME_UNIT_TO_S: Readonly<Record<TimeUnit, { multiply: number; divide: number }>> = {
	s: { multiply: 1, divide: 1 },
	ms: { multiply: 1, divide: 1000 },
	us: { multiply: 1, divide: 1_000_000 },
	min: { multiply: 60, divide: 1 }
};

const TIME_UNITS: Readonly<Record<string, TimeUnit>> = {
	s: 's',
	sec: 's',
	secs: 's',
	second: 's',
	seconds: 's',
	ms: 'ms',
	msec: 'ms',
	millisecond: 'ms',
	milliseconds: 'ms',
	us: 'us',
	µs: 'us',
	μs: 'us',
	usec: 'us',
	microseconds: 'us',
	min: 'min',
	minutes: 'min'
};

const SIGNAL_UNITS: Readonly<Record<string, SignalUnit>> = {
	v: 'V',
	volt: 'V',
	volts: 'V',
	mv: 'mV',
	millivolt: 'mV',
	millivolts: 'mV'
};

const TIME_NAMES = new Set([
	'time',
	't',
	'zeit',
	'temps',
	'tiempo',
	'tempo',
	'tid',
	'elapsed',
	'elapsed time',
	'timestamp',
	'time stamp'
]);
const SIGNAL_NAMES = new Set([
	'volts',
	'volt',
	'voltage',
	'v',
	'u',
	'signal',
	'signal voltage',
	'spannung',
	'tension',
	'tensione',
	'sensor',
	'sensor voltage',
	'output',
	'value',
	'mv',
	'millivolts'
]);
// "Channel A", "Ch 1", "CH1", "chan b", "Kanal A", "A"
const CHANNEL_NAME = /^(?:channel|chan|ch|kanal|canal)?\s*[a-h1-8]$/;

/** Where the two columns are and how to scale them. */
export interface ColumnPlan {
	timeIndex: number;
	voltsIndex: number;
	timeName: string;
	voltsName: string;
	timeUnit: TimeUnit;
	signalUnit: SignalUnit;
}

/** Explicit choices that override what the header says. */
export interface ColumnChoice {
	timeUnit?: TimeUnit;
	/** Header name (case-insensitive) or 1-based column number. */
	timeColumn?: string | number;
	voltsColumn?: string | number;
}

interface HeaderName {
	base: string;
	unit: string | undefined;
}

/** Splits "Time (ms)", "Zeit [s]", "t_ms", "Channel A / V" into a lower-case name and unit. */
export function splitHeaderName(raw: string): HeaderName {
	// Quotes inside a header name ("Channel ""A""") carry no meaning for matching
	const text = raw.trim().toLowerCase().replace(/["']/g, '').replace(/\s+/g, ' ');
	const bracketed = /^(.*?)\s*[([{]\s*([^)\]}]*?)\s*[)\]}]$/.exec(text);
	if (bracketed) return { base: bracketed[1], unit: bracketed[2] };
	const slashed = /^(.+?)\s*\/\s*(\S+)$/.exec(text);
	if (slashed) return { base: slashed[1], unit: slashed[2] };
	const suffixed = /^(.+?)[ _-]+([a-zµμ]+)$/.exec(text);
	if (suffixed && (suffixed[2] in TIME_UNITS || suffixed[2] in SIGNAL_UNITS)) {
		return { base: suffixed[1], unit: suffixed[2] };
	}
	return { base: text, unit: undefined };
}

function isTimeName(name: HeaderName): boolean {
	if (TIME_NAMES.has(name.base)) return true;
	// A bare unit as the whole header ("ms", "s") names the time column
	return name.unit === undefined && name.base in TIME_UNITS;
}

function isSignalName(name: HeaderName): boolean {
	return SIGNAL_NAMES.has(name.base) || CHANNEL_NAME.test(name.base);
}

/**
 * Decides the time and signal columns from a header row.
 * @param header field texts of the header row
 * @param line 1-based line of the header, for error messages
 * @throws CaptureParseError when a column is missing or in a unit other than time / volts
 */
export function planColumns(header: string[], line: number, choice: ColumnChoice = {}): ColumnPlan {
	const names = header.map(splitHeaderName);
	const timeIndex = pickColumn(header, names, choice.timeColumn, isTimeName, line, 'time');
	if (timeIndex < 0) {
		throw new CaptureParseError(
			line,
			1,
			`expected a time column (named e.g. "time", "Time (s)", "t_ms" or "Zeit"), found ${listNames(header)}`
		);
	}
	let voltsIndex = pickColumn(
		header,
		names,
		choice.voltsColumn,
		(n, i) => i !== timeIndex && isSignalName(n),
		line,
		'volts'
	);
	if (voltsIndex < 0 && choice.voltsColumn === undefined) {
		// With just one other column, that column is the signal whatever its name
		const others = header
			.map((_, i) => i)
			.filter((i) => i !== timeIndex && header[i].trim() !== '');
		if (others.length === 1) voltsIndex = others[0];
	}
	if (voltsIndex < 0) {
		throw new CaptureParseError(
			line,
			Math.min(header.length + 1, timeIndex === 0 ? 2 : 1),
			`expected a signal column in volts (named e.g. "volts", "signal" or "Channel A (V)"), found ${listNames(header)}`
		);
	}
	return {
		timeIndex,
		voltsIndex,
		timeName: header[timeIndex].trim(),
		voltsName: header[voltsIndex].trim(),
		timeUnit: choice.timeUnit ?? timeUnitOf(names[timeIndex], header[timeIndex], line, timeIndex),
		signalUnit: signalUnitOf(names[voltsIndex], header[voltsIndex], line, voltsIndex)
	};
}

/** The plan for a file without a header: time in column 1, signal in column 2 unless chosen. */
export function planHeaderless(choice: ColumnChoice = {}, line = 1): ColumnPlan {
	const index = (value: string | number | undefined, fallback: number, what: string): number => {
		if (value === undefined) return fallback;
		if (typeof value === 'number' && Number.isInteger(value) && value >= 1) return value - 1;
		throw new CaptureParseError(
			line,
			1,
			`the file has no header, so the ${what} column must be given as a column number, not "${value}"`
		);
	};
	const timeIndex = index(choice.timeColumn, 0, 'time');
	const voltsIndex = index(choice.voltsColumn, timeIndex === 1 ? 0 : 1, 'volts');
	return {
		timeIndex,
		voltsIndex,
		timeName: `column ${timeIndex + 1}`,
		voltsName: `column ${voltsIndex + 1}`,
		timeUnit: choice.timeUnit ?? 's',
		signalUnit: 'V'
	};
}

/**
 * True when a row reads as a units row under a header, e.g. "(ms)","(V)" or "s;V": every
 * non-empty field is a known time or signal unit, optionally in brackets.
 */
export function isUnitsRow(fields: string[]): boolean {
	const units = fields.map((f) =>
		f
			.trim()
			.toLowerCase()
			.replace(/^[([{]\s*|\s*[)\]}]$/g, '')
	);
	const present = units.filter((u) => u !== '');
	return present.length > 0 && present.every((u) => u in TIME_UNITS || u in SIGNAL_UNITS);
}

/** Applies a units row to a plan whose header carried no units. */
export function applyUnitsRow(
	plan: ColumnPlan,
	fields: string[],
	line: number,
	choice: ColumnChoice
): ColumnPlan {
	const unitAt = (index: number): HeaderName => ({
		base: '',
		unit:
			fields[index]
				?.trim()
				.toLowerCase()
				.replace(/^[([{]\s*|\s*[)\]}]$/g, '') || undefined
	});
	return {
		...plan,
		timeUnit:
			choice.timeUnit ??
			timeUnitOf(
				unitAt(plan.timeIndex),
				fields[plan.timeIndex] ?? '',
				line,
				plan.timeIndex,
				plan.timeUnit
			),
		signalUnit: signalUnitOf(
			unitAt(plan.voltsIndex),
			fields[plan.voltsIndex] ?? '',
			line,
			plan.voltsIndex,
			plan.signalUnit
		)
	};
}

function pickColumn(
	header: string[],
	names: HeaderName[],
	chosen: string | number | undefined,
	matches: (name: HeaderName, index: number) => boolean,
	line: number,
	what: string
): number {
	if (typeof chosen === 'number') {
		if (!Number.isInteger(chosen) || chosen < 1 || chosen > header.length) {
			throw new CaptureParseError(
				line,
				1,
				`the ${what} column was given as number ${chosen}, but the header has ${header.length} columns`
			);
		}
		return chosen - 1;
	}
	if (typeof chosen === 'string') {
		const wanted = chosen.trim().toLowerCase();
		const index = header.findIndex((h) => h.trim().toLowerCase() === wanted);
		if (index < 0) {
			throw new CaptureParseError(
				line,
				1,
				`expected a column named "${chosen}" for ${what}, found ${listNames(header)}`
			);
		}
		return index;
	}
	return names.findIndex(matches);
}

function timeUnitOf(
	name: HeaderName,
	raw: string,
	line: number,
	index: number,
	fallback: TimeUnit = 's'
): TimeUnit {
	if (name.unit === undefined || name.unit === '') {
		return name.base in TIME_UNITS ? TIME_UNITS[name.base] : fallback;
	}
	const unit = TIME_UNITS[name.unit];
	if (unit) return unit;
	throw new CaptureParseError(
		line,
		index + 1,
		`expected the time column in s, ms or µs, found "${raw.trim()}"`
	);
}

function signalUnitOf(
	name: HeaderName,
	raw: string,
	line: number,
	index: number,
	fallback: SignalUnit = 'V'
): SignalUnit {
	if (name.unit === undefined || name.unit === '') {
		return name.base in SIGNAL_UNITS ? SIGNAL_UNITS[name.base] : fallback;
	}
	const unit = SIGNAL_UNITS[name.unit];
	if (unit) return unit;
	throw new CaptureParseError(
		line,
		index + 1,
		`expected the signal column in volts (V or mV), found "${raw.trim()}"`
	);
}

function listNames(header: string[]): string {
	return header.map((h) => `"${h.trim()}"`).join(', ');
}
