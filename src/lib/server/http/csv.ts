/**
 * One CSV cell for a file people open in a spreadsheet.
 *
 * RFC 4180 §2: a field holding a comma, a quote or a line break is quoted, quotes doubled.
 * OWASP "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection): a text cell that begins
 * with `=`, `+`, `-`, `@`, a tab or a carriage return is read as a formula by spreadsheet
 * programs, so such a cell gets a leading single quote and is quoted. Numbers are ours, not
 * typed by anyone, and stay numbers (a negative growth is a number, not a formula).
 */
const FORMULA_START = /^[=+\-@\t\r]/;

export function csvField(value: string | number | null): string {
	if (value === null) return '';
	if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
	const text = FORMULA_START.test(value) ? `'${value}` : value;
	return /[",\r\n]/.test(text) || text !== value ? `"${text.replace(/"/g, '""')}"` : text;
}
