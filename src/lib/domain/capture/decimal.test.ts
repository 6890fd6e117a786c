import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseDecimal } from './decimal';

const parse = (text: string, decimalComma = false) =>
	parseDecimal(text, 0, text.length, decimalComma);

describe('parseDecimal', () => {
	it('equals Number() on plain decimal text', () => {
		// ECMAScript StringToNumber is the reference; the fast path must round identically
		const decimalText = fc
			.tuple(
				fc.constantFrom('', '-', '+'),
				fc.stringMatching(/^[0-9]{1,20}$/),
				fc.option(fc.stringMatching(/^[0-9]{0,20}$/)),
				fc.option(fc.integer({ min: -40, max: 40 }))
			)
			.map(
				([sign, int, frac, exp]) =>
					`${sign}${int}${frac === null ? '' : `.${frac}`}${exp === null ? '' : `e${exp}`}`
			);
		fc.assert(
			fc.property(decimalText, (text) => {
				expect(Object.is(parse(text), Number(text))).toBe(true);
			}),
			{ numRuns: 2000 }
		);
	});

	it('equals Number() on doubles printed by toFixed and String', () => {
		fc.assert(
			fc.property(
				fc.double({ min: -1e6, max: 1e6, noNaN: true }),
				fc.integer({ min: 0, max: 9 }),
				(x, places) => {
					const fixed = x.toFixed(places);
					expect(parse(fixed)).toBe(Number(fixed));
					expect(parse(String(x))).toBe(Number(String(x)));
				}
			)
		);
	});

	it('reads a decimal comma only when allowed', () => {
		expect(parse('0,52', true)).toBe(0.52);
		expect(parse('0,52')).toBeNaN();
		expect(parse('1,5e3', true)).toBe(1500);
		expect(parse('1.2,3', true)).toBeNaN();
	});

	it('reads part of a longer text without cutting it', () => {
		expect(parseDecimal('12.5;0,75', 5, 9, true)).toBe(0.75);
		expect(parseDecimal('12.5;0,75', 0, 4, true)).toBe(12.5);
	});

	it('rejects anything that is not a plain decimal', () => {
		for (const text of [
			'',
			'  ',
			'.',
			'-',
			'+.',
			'1e',
			'1e+',
			'0x10',
			'0b1',
			'Infinity',
			'NaN',
			'1.2.3',
			'12a',
			'a12',
			'1 2',
			'1e400',
			'--1'
		]) {
			expect(parse(text, true), text).toBeNaN();
		}
	});

	it('tolerates spaces around the number', () => {
		expect(parse('  4.5 ')).toBe(4.5);
	});
});
