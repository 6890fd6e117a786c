import { describe, expect, it } from 'vitest';
import {
	decodeAt1imgPayload,
	decodeObdPid7a,
	decodeSpn3251Raw,
	OBD_PID_7A_DELTA_KPA_PER_BIT,
	parseHexBytes
} from './telemetry';

const hex = (s: string) => parseHexBytes(s)!;

describe('SAE J1939 SPN 3251', () => {
	it('reads bytes 5–6 of PGN 64946 little-endian at 0.1 kPa/bit', () => {
		// check value: pretty_j1939 README example, frame 18FDB255#FFFFFFFF0100FFFF (bytes 5–6 = 01 00,
		// raw 1) decodes to "0.1 [kPa]" = 1 mbar (standards.md §1, source (b))
		expect(decodeAt1imgPayload(hex('FFFFFFFF0100FFFF'))).toEqual({ ok: true, mbar: 1 });
	});

	it('puts the least significant byte first', () => {
		// layout: byte offset 4, 2 bytes (standards.md §1, source (a) '3251,4,0,2,FFFF'), little-endian (source (b));
		// 0x0BB8 = 3000 counts × 0.1 kPa = 300 kPa = 3000 mbar; read big-endian it would be 0xB80B
		const result = decodeAt1imgPayload(hex('00 00 00 00 B8 0B 00 00'));
		expect(result.ok && result.mbar).toBeCloseTo(3000, 9);
	});

	it('gives 0.1 kPa, that is 1 mbar, per raw count with no offset', () => {
		// check value: resolution 0.1 kPa/bit, offset 0 (standards.md §1, source (a)); 0.1 kPa = 1 mbar (SI)
		const r = decodeSpn3251Raw(287);
		expect(r.ok && r.mbar).toBeCloseTo(287, 9);
	});

	it('accepts the top of the data range and refuses indicator values above it', () => {
		// check value: data range 0 to 6 425.5 kPa = raw 0xFAFF (standards.md §1, source (a))
		const top = decodeSpn3251Raw(0xfaff);
		expect(top.ok && top.mbar).toBeCloseTo(64255, 6);
		expect(decodeSpn3251Raw(0xfb00)).toMatchObject({ ok: false });
		// 0xFFFF "not available" (standards.md §1, from a public J1939-71 interface summary)
		expect(decodeSpn3251Raw(0xffff)).toMatchObject({
			ok: false,
			reason: expect.stringContaining('not available')
		});
	});

	it('refuses a payload that is not 8 bytes', () => {
		expect(decodeAt1imgPayload(hex('0100'))).toMatchObject({ ok: false });
	});
});

describe('OBD-II PID $7A', () => {
	it('reads the delta pressure from bytes B (MSB) and C, scaled by the named constant', () => {
		// layout: 41 7A A B C D E F G, delta = B×256 + C (standards.md §2, sources (d), (e), (f));
		// the scale is uncertain, so the expected value goes through the same constant
		const r = decodeObdPid7a(hex('41 7A 01 01 2C 00 00 00 00'));
		expect(r.ok && r.mbar).toBeCloseTo(300 * OBD_PID_7A_DELTA_KPA_PER_BIT * 10, 9);
	});

	it('takes the 7 data bytes without the 41 7A header too', () => {
		expect(decodeObdPid7a(hex('01 01 2C 00 00 00 00'))).toEqual(
			decodeObdPid7a(hex('41 7A 01 01 2C 00 00 00 00'))
		);
	});

	it("reads B–C as signed two's complement", () => {
		// signed 16-bit (standards.md §2, sources (d) and (e)): 0xFF38 = −200 counts
		const r = decodeObdPid7a(hex('01 FF 38 00 00 00 00'));
		expect(r.ok && r.mbar).toBeCloseTo(-200 * OBD_PID_7A_DELTA_KPA_PER_BIT * 10, 9);
	});

	it('keeps the scale at 0.01 kPa per bit until SAE J1979 is checked', () => {
		// best reading of standards.md §2: 0.01 kPa/bit in sources (e) and (f); (d) says 0.1
		expect(OBD_PID_7A_DELTA_KPA_PER_BIT).toBe(0.01);
	});

	it('refuses an answer whose support bit says delta pressure is not supported', () => {
		// support bits: 0x01 delta, 0x02 inlet, 0x04 outlet (standards.md §2, sources (d) and (e))
		expect(decodeObdPid7a(hex('06 01 2C 00 00 00 00'))).toMatchObject({
			ok: false,
			reason: expect.stringContaining('not supported')
		});
	});

	it('refuses reserved bits in byte A', () => {
		// reserved bits 3–7 must be 0: J1699-3 fails on 0xF8 (standards.md §2, source (d))
		expect(decodeObdPid7a(hex('09 01 2C 00 00 00 00'))).toMatchObject({
			ok: false,
			reason: expect.stringContaining('reserved')
		});
	});

	it('refuses the wrong number of bytes and a wrong header', () => {
		expect(decodeObdPid7a(hex('01 01 2C'))).toMatchObject({ ok: false });
		expect(decodeObdPid7a(hex('41 7B 01 01 2C 00 00 00 00'))).toMatchObject({ ok: false });
	});
});

describe('parseHexBytes', () => {
	it('reads spaced, dashed and compact hex, and refuses anything else', () => {
		expect(Array.from(parseHexBytes('41 7a-01:00')!)).toEqual([0x41, 0x7a, 0x01, 0x00]);
		expect(parseHexBytes('417')).toBeNull();
		expect(parseHexBytes('zz')).toBeNull();
		expect(parseHexBytes('')).toBeNull();
	});
});
