/**
 * Δp as telematics units send it: SAE J1939 SPN 3251 (PGN 64946, AT1IMG) and OBD-II
 * service $01 PID $7A (DPF bank 1). Neither standard is freely published; layouts and scales
 * come from the open-source decoders cited in docs/method.md, "Telemetry encodings".
 */

/** What a decoder returns: Δp in mbar, or why there is no value. */
export type DecodedDeltaP = { ok: true; mbar: number } | { ok: false; reason: string };

/**
 * SPN 3251 "Aftertreatment 1 DPF differential pressure": PGN 64946 (0xFDB2, AT1IMG), bytes 5–6
 * (1-based; byte offset 4), 16 bits little-endian, 0.1 kPa/bit, offset 0, data range
 * 0 to 6 425.5 kPa (raw 0 to 64 255 = 0xFAFF). Sources: open-source J1939 PGN/SPN tables and the
 * pretty_j1939 example decode.
 */
export const J1939_SPN3251 = Object.freeze({
	pgn: 64946,
	byteOffset: 4,
	kpaPerBit: 0.1,
	offsetKpa: 0,
	maxValidRaw: 0xfaff
});

/** 1 kPa = 10 mbar (SI prefixes: 1000 Pa and 100 Pa). */
const MBAR_PER_KPA = 10;

/**
 * A raw SPN 3251 count → Δp in mbar (`raw × 0.1 kPa`; with 0.1 kPa = 1 mbar the count is the
 * value in mbar). Counts above 0xFAFF are indicators, not values (J1939-71 reserves them for
 * error and not-available markers; the exact sub-ranges are from memory, so any of them is
 * refused the same way).
 */
export function decodeSpn3251Raw(raw: number): DecodedDeltaP {
	if (!Number.isInteger(raw) || raw < 0 || raw > 0xffff) {
		return {
			ok: false,
			reason: `SPN 3251 raw counts are whole numbers from 0 to 65535, got ${raw}`
		};
	}
	if (raw > J1939_SPN3251.maxValidRaw) {
		const hex = `0x${raw.toString(16).toUpperCase()}`;
		return {
			ok: false,
			reason: `SPN 3251 raw value ${hex} is above 0xFAFF: the unit sent an error or "not available" marker, not a pressure`
		};
	}
	return {
		ok: true,
		mbar: (raw * J1939_SPN3251.kpaPerBit + J1939_SPN3251.offsetKpa) * MBAR_PER_KPA
	};
}

/** Reads SPN 3251 from a PGN 64946 payload (8 data bytes, as sent on the bus). */
export function decodeAt1imgPayload(data: Uint8Array): DecodedDeltaP {
	if (data.length !== 8)
		return { ok: false, reason: `a PGN 64946 payload has 8 bytes, got ${data.length}` };
	const offset = J1939_SPN3251.byteOffset;
	// Little-endian: the least significant byte comes first (byte 5)
	return decodeSpn3251Raw(data[offset] | (data[offset + 1] << 8));
}

/**
 * OBD-II PID $7A delta-pressure resolution, kPa per bit. UNCERTAIN: two of three open sources
 * give 0.01 kPa/bit (signed), one old J1699-3 revision 0.1 kPa/bit; kept as one named constant
 * until SAE J1979 confirms it (standards.md §2).
 */
export const OBD_PID_7A_DELTA_KPA_PER_BIT = 0.01;

/**
 * Byte layout of the PID $7A answer `41 7A A B C D E F G`: A holds support bits (0x01 delta
 * pressure, 0x02 inlet, 0x04 outlet; 0xF8 reserved, must be zero), B–C the delta pressure,
 * most significant byte first, read as signed two's complement (two of three sources).
 */
export const OBD_PID_7A = Object.freeze({
	mode: 0x41,
	pid: 0x7a,
	dataBytes: 7,
	deltaSupportedMask: 0x01,
	reservedMask: 0xf8,
	deltaMsbIndex: 1
});

/**
 * Δp from the data bytes of a PID $7A answer. Accepts the 7 data bytes A–G, or 9 bytes with
 * the leading `41 7A`.
 */
export function decodeObdPid7a(bytes: Uint8Array): DecodedDeltaP {
	let data = bytes;
	if (bytes.length === OBD_PID_7A.dataBytes + 2) {
		if (bytes[0] !== OBD_PID_7A.mode || bytes[1] !== OBD_PID_7A.pid) {
			return { ok: false, reason: 'a 9-byte PID 7A answer must start with 41 7A' };
		}
		data = bytes.subarray(2);
	}
	if (data.length !== OBD_PID_7A.dataBytes) {
		return { ok: false, reason: `PID 7A carries 7 data bytes (A to G), got ${bytes.length} bytes` };
	}
	const support = data[0];
	if (support & OBD_PID_7A.reservedMask) {
		return {
			ok: false,
			reason: 'PID 7A byte A has reserved bits set (0xF8): the answer is malformed'
		};
	}
	if (!(support & OBD_PID_7A.deltaSupportedMask)) {
		return {
			ok: false,
			reason: 'PID 7A byte A says delta pressure is not supported by this engine controller'
		};
	}
	const i = OBD_PID_7A.deltaMsbIndex;
	const unsigned = (data[i] << 8) | data[i + 1];
	const signed = unsigned >= 0x8000 ? unsigned - 0x10000 : unsigned;
	return { ok: true, mbar: signed * OBD_PID_7A_DELTA_KPA_PER_BIT * MBAR_PER_KPA };
}

/** "41 7A 01 00 64 …", "417A0100…" or "41-7A-01…" → bytes; null when it is not hex pairs. */
export function parseHexBytes(text: string): Uint8Array | null {
	const compact = text.replace(/[\s:-]/g, '');
	if (compact.length === 0 || compact.length % 2 !== 0 || !/^[0-9a-f]+$/i.test(compact))
		return null;
	const out = new Uint8Array(compact.length / 2);
	for (let i = 0; i < out.length; i++) out[i] = parseInt(compact.slice(2 * i, 2 * i + 2), 16);
	return out;
}
