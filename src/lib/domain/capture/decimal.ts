/**
 * Reads a decimal number straight from a slice of text, without cutting a substring: the
 * capture parser's hot path, run millions of times per file.
 */

// Exact powers of ten: every 10^k for k ≤ 22 is representable in a double
const POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => 10 ** k);
const MAX_EXACT_DIGITS = 15;

/**
 * Parses text[start, end) as a plain decimal (optional sign, digits with one decimal mark,
 * optional exponent, spaces around). Returns NaN for anything else, including hex, "Infinity"
 * and blanks. The result equals JavaScript's Number() of the same text: up to 15 significant
 * digits and a net power of ten within ±22, mantissa and power are both exact and one
 * multiplication or division rounds correctly (Clinger 1990, "How to read floating point
 * numbers accurately"); anything longer goes through Number().
 * @param decimalComma accept ',' as the decimal mark (never both ',' and '.')
 */
export function parseDecimal(
	text: string,
	start: number,
	end: number,
	decimalComma: boolean
): number {
	let i = start;
	while (i < end && text.charCodeAt(i) === 32) i++;
	let last = end;
	while (last > i && text.charCodeAt(last - 1) === 32) last--;
	if (i >= last) return NaN;
	let negative = false;
	let c = text.charCodeAt(i);
	if (c === 45 || c === 43) {
		negative = c === 45;
		i++;
	}
	let mantissa = 0;
	let digits = 0;
	let significant = 0;
	let fractionDigits = 0;
	let seenMark = false;
	let commaMark = false;
	for (; i < last; i++) {
		c = text.charCodeAt(i);
		if (c >= 48 && c <= 57) {
			digits++;
			if (significant > 0 || c !== 48) significant++;
			mantissa = mantissa * 10 + (c - 48);
			if (seenMark) fractionDigits++;
		} else if ((c === 46 || (c === 44 && decimalComma)) && !seenMark) {
			seenMark = true;
			commaMark = c === 44;
		} else {
			break;
		}
	}
	if (digits === 0) return NaN;
	let exponent = 0;
	if (i < last) {
		c = text.charCodeAt(i);
		if (c !== 101 && c !== 69) return NaN;
		i++;
		let expNegative = false;
		c = text.charCodeAt(i);
		if (c === 45 || c === 43) {
			expNegative = c === 45;
			i++;
		}
		let expDigits = 0;
		for (; i < last; i++) {
			c = text.charCodeAt(i);
			if (c < 48 || c > 57) return NaN;
			exponent = exponent * 10 + (c - 48);
			expDigits++;
		}
		if (expDigits === 0) return NaN;
		if (expNegative) exponent = -exponent;
	}
	const power = exponent - fractionDigits;
	if (significant > MAX_EXACT_DIGITS || power > 22 || power < -22) {
		// Rare: too many digits for the exact path; let Number() round it
		const slice = text.slice(start, end);
		const value = Number(commaMark ? slice.replace(',', '.') : slice);
		return Number.isFinite(value) ? value : NaN;
	}
	const magnitude = power >= 0 ? mantissa * POWERS_OF_TEN[power] : mantissa / POWERS_OF_TEN[-power];
	return negative ? -magnitude : magnitude;
}
