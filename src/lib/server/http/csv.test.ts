import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { csvField } from './csv';

describe('csvField', () => {
	// RFC 4180 §2 rules 6 and 7: quote fields with commas, quotes or line breaks; double quotes.
	it('quotes what RFC 4180 says must be quoted', () => {
		expect(csvField('Depot North')).toBe('Depot North');
		expect(csvField('North, East')).toBe('"North, East"');
		expect(csvField('the "big" van')).toBe('"the ""big"" van"');
		expect(csvField('two\r\nlines')).toBe('"two\r\nlines"');
		expect(csvField(null)).toBe('');
	});

	// OWASP "CSV Injection": cells starting with = + - @ tab or CR are prefixed with ' and quoted.
	it.each([
		'=HYPERLINK("http://evil.example","Open")',
		'+1+1',
		'-1-1',
		'@SUM(A1:A2)',
		'\t=1+1',
		'\r=1+1'
	])('neutralises the formula-leading cell %j', (cell) => {
		const written = csvField(cell);
		// csv-parse (a reference parser from npm) reads back the text with a leading quote.
		const [[readBack]] = parse(written, { relax_quotes: false }) as string[][];
		expect(readBack).toBe(`'${cell}`);
		expect(written.startsWith('"\'')).toBe(true);
	});

	it('keeps numbers, negative ones included, as numbers', () => {
		expect(csvField(-12)).toBe('-12');
		expect(csvField(281.5)).toBe('281.5');
		expect(csvField(Number.NaN)).toBe('');
	});
});
