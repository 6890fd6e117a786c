import { describe, expect, it } from 'vitest';
import { notTextMessage, sniffContent, sniffMediaType } from './sniff';

const bytes = (...values: number[]) => Uint8Array.from(values);
const text = (s: string) => new TextEncoder().encode(s);

describe('sniffContent', () => {
	it('reads an empty file as empty', () => {
		expect(sniffContent(new Uint8Array(0))).toEqual({ kind: 'empty' });
	});

	it('reads a plain CSV as UTF-8 text', () => {
		expect(
			sniffContent(text('registration,taken_at,dp_mbar\nLKD 401,2025-03-01 08:00,120\n'))
		).toEqual({
			kind: 'text',
			encoding: 'utf-8'
		});
	});

	it('names an Excel workbook renamed to .csv', () => {
		// check value: ZIP local file header "PK\x03\x04" (PKWARE APPNOTE.TXT 4.3.7), the container of .xlsx
		const sniffed = sniffContent(bytes(0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x06, 0x00));
		expect(sniffed).toEqual({ kind: 'binary', looksLike: expect.stringContaining('.xlsx') });
		expect(notTextMessage(sniffed, 'readings.csv')).toMatch(
			/not a text \(CSV\) file.*save or export it as CSV/
		);
	});

	it('names a PDF renamed to .csv', () => {
		// check value: "%PDF" opens every PDF file (ISO 32000-1, 7.5.2 File header)
		expect(sniffContent(text('%PDF-1.7\n%âãÏÓ\n'))).toEqual({
			kind: 'binary',
			looksLike: 'a PDF document'
		});
	});

	it('calls a file with NUL bytes binary even without a known signature', () => {
		expect(sniffContent(bytes(0x01, 0x02, 0x00, 0x41, 0x42))).toEqual({
			kind: 'binary',
			looksLike: null
		});
	});

	it('reads Latin-1 exports (not valid UTF-8) as Windows-1252 text', () => {
		// "£" is 0xA3 in Windows-1252, a lone continuation byte in UTF-8
		expect(sniffContent(bytes(0x61, 0x2c, 0xa3, 0x0a))).toEqual({
			kind: 'text',
			encoding: 'windows-1252'
		});
	});

	it('does not mistake a UTF-8 character cut at the end of the sample for bad text', () => {
		const full = text('time,Δp\n'); // Δ is two bytes in UTF-8
		const cut = full.subarray(0, full.indexOf(0x94)); // keep Δ's lead byte only
		expect(sniffContent(cut)).toEqual({ kind: 'text', encoding: 'utf-8' });
	});

	it('asks for UTF-8 when a file is saved as UTF-16', () => {
		const sniffed = sniffContent(bytes(0xff, 0xfe, 0x61, 0x00));
		expect(notTextMessage(sniffed, 'x.csv')).toMatch(/UTF-16/);
	});
});

describe('sniffMediaType', () => {
	it('knows a JPEG, a PNG, a WebP and a PDF by their first bytes', () => {
		// check value: SOI marker FF D8 then a marker's FF (ITU-T T.81, B.1.1.3 and B.2.1)
		expect(sniffMediaType(bytes(0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10))).toBe('image/jpeg');
		// check value: the eight-byte PNG signature (PNG specification, 3rd ed., 5.2)
		expect(sniffMediaType(bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13))).toBe(
			'image/png'
		);
		// check value: "RIFF", a little-endian size, then "WEBP" (RFC 9649, 2.5 RIFF header)
		expect(sniffMediaType(text('RIFF\x24\x00\x00\x00WEBPVP8 '))).toBe('image/webp');
		// check value: "%PDF-" opens every PDF file (ISO 32000-1, 7.5.2 File header)
		expect(sniffMediaType(text('%PDF-1.7\n'))).toBe('application/pdf');
	});

	it('refuses other files whatever they are called', () => {
		expect(sniffMediaType(text('<svg xmlns="http://www.w3.org/2000/svg"/>'))).toBeNull();
		expect(sniffMediaType(text('RIFF\x24\x00\x00\x00WAVEfmt '))).toBeNull(); // RIFF audio
		expect(sniffMediaType(bytes(0x47, 0x49, 0x46, 0x38, 0x39, 0x61))).toBeNull(); // GIF
		expect(sniffMediaType(bytes(0x89, 0x50, 0x4e, 0x47))).toBeNull(); // PNG cut short
		expect(sniffMediaType(new Uint8Array(0))).toBeNull();
	});
});
