import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { CaptureParseError, createCaptureParser, parseCaptureText } from './parser';

/** Runs the parser and returns the thrown CaptureParseError (fails the test if none). */
function parseError(
	text: string,
	options: Parameters<typeof parseCaptureText>[1] = {}
): CaptureParseError {
	try {
		parseCaptureText(text, options);
	} catch (error) {
		expect(error).toBeInstanceOf(CaptureParseError);
		return error as CaptureParseError;
	}
	throw new Error('expected a CaptureParseError');
}

describe('capture parser: header variants', () => {
	it('reads a plain "time,volts" file in seconds', () => {
		const { timesS, volts, info } = parseCaptureText(
			'time,volts\n0,0.50\n0.001,0.52\n0.002,0.55\n'
		);
		expect(timesS).toEqual([0, 0.001, 0.002]);
		expect(volts).toEqual([0.5, 0.52, 0.55]);
		expect(info).toMatchObject({ sampleCount: 3, separator: ',', hasHeader: true, timeUnit: 's' });
		expect(info.timeColumn).toBe('time');
		expect(info.voltsColumn).toBe('volts');
	});

	it.each([
		['Time (s),Channel A (V)', 's'],
		['Time [ms],Channel A (V)', 'ms'],
		['t_ms,signal', 'ms'],
		['Zeit,Spannung', 's'],
		['Zeit [ms],Spannung [V]', 'ms'],
		['time_s,voltage', 's'],
		['Time / ms,Ch1', 'ms'],
		['ms,value', 'ms'],
		['Time (us),CH A', 'us']
	])('understands the header %s', (header, unit) => {
		const { timesS, volts, info } = parseCaptureText(`${header}\n2,0.5\n4,0.75\n`);
		// ms and µs divide exactly (4 ms = 0.004 s)
		const divisor = unit === 'ms' ? 1000 : unit === 'us' ? 1_000_000 : 1;
		expect(info.timeUnit).toBe(unit);
		expect(timesS).toEqual([2 / divisor, 4 / divisor]);
		expect(volts).toEqual([0.5, 0.75]);
	});

	it('finds the columns wherever they stand and ignores the others', () => {
		const { timesS, volts, info } = parseCaptureText(
			'sample,Channel B (V),Time (s),Channel A (V)\n1,3.3,0.5,0.61\n'
		);
		expect(timesS).toEqual([0.5]);
		// The first channel column in the header is taken
		expect(volts).toEqual([3.3]);
		expect(info.voltsColumn).toBe('Channel B (V)');
	});

	it('lets the caller choose the signal column by name or number', () => {
		const text = 'Time (s),Channel A (V),Channel B (V)\n0,0.5,2.0\n';
		expect(parseCaptureText(text, { voltsColumn: 'channel b (v)' }).volts).toEqual([2]);
		expect(parseCaptureText(text, { voltsColumn: 3 }).volts).toEqual([2]);
	});

	it('scales a signal column in millivolts', () => {
		const { volts } = parseCaptureText('Time (ms),Channel A (mV)\n0,500\n1,1250\n');
		expect(volts).toEqual([0.5, 1.25]);
	});

	it('takes units from a units row under the header', () => {
		const { timesS, volts } = parseCaptureText('Time,Channel A\n(ms),(mV)\n\n10,512\n20,530\n');
		expect(timesS).toEqual([0.01, 0.02]);
		expect(volts).toEqual([0.512, 0.53]);
	});

	it('lets an explicit time unit override the header', () => {
		const { timesS } = parseCaptureText('time,volts\n5,0.5\n', { timeUnit: 'ms' });
		expect(timesS).toEqual([0.005]);
	});

	it('reads a file without a header as time, volts', () => {
		const { timesS, volts, info } = parseCaptureText('0,0.5\n0.5,0.6\n');
		expect(info.hasHeader).toBe(false);
		expect(timesS).toEqual([0, 0.5]);
		expect(volts).toEqual([0.5, 0.6]);
	});

	it('reads a header-less millisecond file when told the unit', () => {
		const { timesS } = parseCaptureText('0;0,5\n250;0,6\n', { timeUnit: 'ms' });
		expect(timesS).toEqual([0, 0.25]);
	});

	it('skips a byte-order mark, CRLF endings and blank lines', () => {
		const { timesS, volts } = parseCaptureText(
			'\uFEFFtime,volts\r\n\r\n0,0.5\r\n,\r\n , \r\n1,0.6'
		);
		expect(timesS).toEqual([0, 1]);
		expect(volts).toEqual([0.5, 0.6]);
	});
});

describe('capture parser: separators and decimals', () => {
	it('detects semicolons and reads decimal commas', () => {
		const { timesS, volts, info } = parseCaptureText(
			'Zeit [ms];Spannung [V]\n0;0,512\n1,5;0,530\n'
		);
		expect(info.separator).toBe(';');
		expect(timesS).toEqual([0, 0.0015]);
		expect(volts).toEqual([0.512, 0.53]);
	});

	it('detects tabs', () => {
		const { volts, info } = parseCaptureText('time\tvolts\n0\t0.5\n');
		expect(info.separator).toBe('\t');
		expect(volts).toEqual([0.5]);
	});

	it('refuses decimal commas when told to', () => {
		const error = parseError('time;volts\n0;0,5\n', { decimalComma: false });
		expect(error.message).toBe('Line 2, column 2: expected a number for volts, found "0,5"');
	});

	it('reads exponents and explicit signs', () => {
		const { timesS, volts } = parseCaptureText('time,volts\n-1e-3,+5.0E-1\n.5,1.\n');
		expect(timesS).toEqual([-0.001, 0.5]);
		expect(volts).toEqual([0.5, 1]);
	});
});

describe('capture parser: RFC 4180 quoting', () => {
	it('reads quoted fields, doubled quotes and line breaks inside quotes', () => {
		// RFC 4180 §2 rules 5–7: fields in double quotes; CRLF, commas and "" allowed inside
		const text =
			'"Time (s)","Channel ""A"" (V)","note"\r\n' +
			'"0.000","0.50","start, cold"\r\n' +
			'"0.001",0.52,"two\r\nlines"\r\n' +
			'0.002,"0,55",plain\r\n';
		const { timesS, volts, info } = parseCaptureText(text);
		expect(timesS).toEqual([0, 0.001, 0.002]);
		// A quoted "0,55" in a comma file cannot be a separator: decimal comma
		expect(volts).toEqual([0.5, 0.52, 0.55]);
		expect(info.voltsColumn).toBe('Channel "A" (V)');
		expect(info.lineCount).toBe(5);
	});

	it('counts lines inside quoted fields when reporting errors', () => {
		const error = parseError('time,volts,note\n0,0.5,"a\nb"\n1,x,c\n');
		expect(error.line).toBe(4);
		expect(error.column).toBe(2);
	});

	it('does not count separators inside quotes when detecting the separator', () => {
		const { info, volts } = parseCaptureText('"time","signal; raw"\n0,0.5\n');
		expect(info.separator).toBe(',');
		expect(volts).toEqual([0.5]);
	});

	it('gives the same samples however the text is split into chunks', () => {
		const text =
			'"Time (ms)";"Channel A (V)"\r\n' +
			Array.from({ length: 60 }, (_, i) =>
				i % 3 === 0 ? `"${i}";"0,${500 + i}"` : `${i};0,${500 + i}`
			).join('\r\n') +
			'\r\n';
		const whole = parseCaptureText(text);
		fc.assert(
			fc.property(
				fc.uniqueArray(fc.integer({ min: 1, max: text.length - 1 }), { maxLength: 40 }),
				(cuts) => {
					const bounds = [0, ...cuts.sort((a, b) => a - b), text.length];
					const timesS: number[] = [];
					const volts: number[] = [];
					const parser = createCaptureParser({
						onSample: (t, v) => {
							timesS.push(t);
							volts.push(v);
						}
					});
					for (let i = 0; i + 1 < bounds.length; i++)
						parser.push(text.slice(bounds[i], bounds[i + 1]));
					const info = parser.end();
					expect(timesS).toEqual(whole.timesS);
					expect(volts).toEqual(whole.volts);
					expect(info).toEqual(whole.info);
				}
			)
		);
	});
});

describe('capture parser: bad input', () => {
	it('points at the line and column of a bad number', () => {
		const rows = Array.from({ length: 1040 }, (_, i) => `${i};0,5`);
		const text = `time;volts\n${rows.join('\n')}\n1040;4,5x\n`;
		const error = parseError(text);
		expect(error.message).toBe('Line 1042, column 2: expected a number for volts, found "4,5x"');
		expect(error.line).toBe(1042);
		expect(error.column).toBe(2);
	});

	it('points at a bad time value in column 1', () => {
		expect(parseError('time,volts\n0,0.5\nabc,0.5\n').message).toBe(
			'Line 3, column 1: expected a number for time, found "abc"'
		);
	});

	it('rejects hexadecimal and infinite values', () => {
		expect(parseError('time,volts\n0x10,0.5\n').message).toContain('found "0x10"');
		expect(parseError('time,volts\n0,Infinity\n').message).toContain('found "Infinity"');
	});

	it('names an empty field', () => {
		expect(parseError('time,volts\n0,\n').message).toBe(
			'Line 2, column 2: expected a number for volts, found an empty field'
		);
	});

	it('says when a row stops short', () => {
		expect(parseError('time,volts\n0,0.5\n1\n').message).toBe(
			'Line 3, column 2: expected a number for volts, found the end of the line (the row has 1 of 2 columns)'
		);
	});

	it('says an empty file is empty', () => {
		for (const text of ['', '   ', '\n\n', '\uFEFF']) {
			const error = parseError(text);
			expect(error.message).toBe(
				'Line 1, column 1: the file is empty: expected a header such as "time,volts" followed by samples'
			);
		}
	});

	it('says when a header has no samples after it', () => {
		expect(parseError('time,volts\n').message).toBe(
			'Line 2, column 1: expected samples after the header, found the end of the file'
		);
	});

	it('says which column is missing from the header', () => {
		expect(parseError('sample,volts\n1,0.5\n').message).toBe(
			'Line 1, column 1: expected a time column (named e.g. "time", "Time (s)", "t_ms" or "Zeit"), found "sample", "volts"'
		);
		expect(parseError('time,rpm,load\n0,800,10\n').message).toBe(
			'Line 1, column 2: expected a signal column in volts (named e.g. "volts", "signal" or "Channel A (V)"), found "time", "rpm", "load"'
		);
	});

	it('rejects a column in the wrong unit', () => {
		expect(parseError('Time (h),volts\n0,0.5\n').message).toBe(
			'Line 1, column 1: expected the time column in s, ms or µs, found "Time (h)"'
		);
		expect(parseError('time,Channel A (mbar)\n0,0.5\n').message).toBe(
			'Line 1, column 2: expected the signal column in volts (V or mV), found "Channel A (mbar)"'
		);
	});

	it('rejects time that goes backwards, naming both lines', () => {
		expect(parseError('Time (ms),volts\n0,0.5\n10,0.5\n9,0.5\n').message).toBe(
			'Line 4, column 1: expected time to keep rising, found 9 ms after 10 ms on line 3; time must not go backwards'
		);
	});

	it('rejects a row with more columns than the header, hinting at decimal commas', () => {
		expect(parseError('time,volts\n0,0.5\n0,001,0,52\n').message).toBe(
			'Line 3, column 3: expected 2 columns as in the header, found 4; a comma used as decimal mark needs a semicolon or tab between columns'
		);
	});

	it('accepts empty trailing fields', () => {
		expect(parseCaptureText('time,volts,\n0,0.5,\n1,0.6,,\n').volts).toEqual([0.5, 0.6]);
	});

	it('accepts repeated timestamps', () => {
		expect(parseCaptureText('time,volts\n0,0.5\n0,0.6\n').timesS).toEqual([0, 0]);
	});

	it('reports a quoted field that is never closed', () => {
		expect(parseError('time,volts\n0,"0.5\n1,0.6\n').message).toBe(
			'Line 2, column 2: a quoted field is never closed: expected a closing double quote (")'
		);
	});

	it('reports text after a closing quote', () => {
		expect(parseError('time,volts\n"0"x,0.5\n').message).toBe(
			'Line 2, column 1: expected a separator (a comma) after the closing quote, found "x"'
		);
	});

	it('reports a stray quote inside an unquoted field', () => {
		expect(parseError('time,volts\n0,0.5"\n').message).toContain(
			'Line 2, column 2: found a double quote inside an unquoted field'
		);
	});
});
