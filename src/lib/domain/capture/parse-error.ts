/** A capture file that cannot be read, pointing at the line and column (both 1-based). */
export class CaptureParseError extends Error {
	readonly line: number;
	readonly column: number;
	/** The message without the "Line …, column …:" prefix. */
	readonly detail: string;

	constructor(line: number, column: number, detail: string) {
		super(`Line ${line}, column ${column}: ${detail}`);
		this.name = 'CaptureParseError';
		this.line = line;
		this.column = column;
		this.detail = detail;
	}
}
