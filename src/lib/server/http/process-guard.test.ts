import { describe, expect, it } from 'vitest';
import { isStrayStreamError } from './process-guard';

describe('isStrayStreamError', () => {
	it("survives a request stream's breakdown", () => {
		// busboy 1.6's own messages for a body that ends early (lib/types/multipart.js)
		expect(isStrayStreamError(new Error('Unexpected end of form'))).toBe(true);
		expect(isStrayStreamError(new Error('Unexpected end of file'))).toBe(true);
		expect(
			isStrayStreamError(Object.assign(new Error('socket hang up'), { code: 'ECONNRESET' }))
		).toBe(true);
	});

	it('lets every other error end the process', () => {
		expect(
			isStrayStreamError(new TypeError("Cannot read properties of undefined (reading 'id')"))
		).toBe(false);
		expect(isStrayStreamError(new Error('SQLITE_CORRUPT: database disk image is malformed'))).toBe(
			false
		);
		expect(isStrayStreamError('Unexpected end of form')).toBe(false);
	});
});
