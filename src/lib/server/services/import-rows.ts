/**
 * Checking one CSV record of an import and turning it into a row to store. Every problem
 * names the line, the column and what was expected, in words for the person at the screen.
 */
import type { FileProblem } from './errors';
import { parseDateCell, parseNumberCell } from './import-values';
import { FUTURE_TOLERANCE_MS } from './telemetry';
import { toMbar } from '../../domain/units';
import {
	checkCircuit,
	DEFAULT_CIRCUIT_LIMITS,
	voltsToMbar,
	type SensorType
} from '../../domain/sensor';
import type { Fuel, TestCondition } from '../../domain/vocabulary';
import { IMPORT_FIELDS, type ImportKind, type ImportSettingsInput } from '../../validation/imports';
import type { NewReadingRow } from './reading-writes';

/** Δp a reading may have once converted, mbar. */
export const DELTA_P_RANGE_MBAR = { min: 0, max: 10_000 } as const;

export interface RowContext {
	kind: ImportKind;
	settings: ImportSettingsInput;
	header: string[];
	/** Field key → 0-based column index in the file. */
	columnOf: Map<string, number>;
	decimalComma: boolean;
	timeZone: string;
	now: Date;
	/** Registration (normalised) → ids of vans within reach with it. */
	vans: Map<string, number[]>;
	sensor: SensorType | null;
	/** Depot name (lower case) → id, for vans imports. */
	depots: Map<string, number>;
}

export type ReadingRow = Omit<NewReadingRow, 'importBatchId' | 'authorId' | 'source'>;
export interface TripRow {
	vehicleId: number;
	startedAt: Date;
	endedAt: Date;
	distanceKm: number;
	idleMinutes: number;
	meanSpeedKmh: number | null;
}
export interface VehicleRow {
	registration: string;
	makeModel: string | null;
	vin: string | null;
	emissionClass: string | null;
	fuel: Fuel;
	oilGrade: string | null;
	engineDisplacementCc: number | null;
	depotId: number | null;
}
export type ImportRow = ReadingRow | TripRow | VehicleRow;

export interface CheckedRecord {
	line: number;
	row: ImportRow | null;
	problems: FileProblem[];
	/** Field key → the value as understood, for the preview. */
	shown: Record<string, string>;
}

export const normalRegistration = (r: string) => r.trim().toUpperCase().replace(/\s+/g, ' ');

const CONDITION_WORDS: Record<string, TestCondition> = {
	idle: 'idle',
	raisedidle: 'raised_idle',
	fastidle: 'raised_idle',
	highidle: 'raised_idle',
	road: 'road_load',
	roadload: 'road_load',
	load: 'road_load',
	driving: 'road_load',
	telemetry: 'telemetry'
};

const FUEL_WORDS: Record<string, Fuel> = {
	diesel: 'en590_diesel',
	en590: 'en590_diesel',
	en590diesel: 'en590_diesel',
	biodiesel: 'biodiesel_blend',
	biodieselblend: 'biodiesel_blend',
	b7: 'biodiesel_blend',
	b10: 'biodiesel_blend',
	b20: 'biodiesel_blend',
	b30: 'biodiesel_blend',
	hvo: 'paraffinic_en15940',
	paraffinic: 'paraffinic_en15940',
	en15940: 'paraffinic_en15940',
	paraffinicen15940: 'paraffinic_en15940'
};

const squash = (s: string) => s.toLowerCase().replace(/[^a-z0-9δ]/g, '');

/** Checks one record; `record` holds the raw field texts, `line` its 1-based line. */
export function checkRecord(ctx: RowContext, record: string[], line: number): CheckedRecord {
	const problems: FileProblem[] = [];
	const shown: Record<string, string> = {};
	const fields = IMPORT_FIELDS[ctx.kind];
	const label = (key: string) => fields.find((f) => f.key === key)?.label ?? key;

	const cell = (key: string): { text: string; column: number } | null => {
		const index = ctx.columnOf.get(key);
		if (index === undefined) return null;
		return { text: (record[index] ?? '').trim(), column: index + 1 };
	};
	const problem = (key: string, message: string) => {
		const index = ctx.columnOf.get(key) ?? 0;
		problems.push({ line, column: index + 1, columnName: ctx.header[index], message });
	};
	const found = (text: string) =>
		text === '' ? 'an empty cell' : `“${text.length > 40 ? text.slice(0, 40) + '…' : text}”`;

	const required = (key: string): string | null => {
		const c = cell(key);
		if (!c) return null;
		if (c.text === '') {
			problem(key, `expected ${label(key).toLowerCase()}, found an empty cell`);
			return null;
		}
		return c.text;
	};
	const number = (
		key: string,
		min: number,
		max: number,
		unit: string,
		optional: boolean
	): number | null => {
		const c = cell(key);
		if (!c || (optional && c.text === '')) return null;
		const parsed = parseNumberCell(c.text, ctx.decimalComma);
		if (!parsed.ok) {
			problem(
				key,
				`expected ${parsed.expected} for ${label(key).toLowerCase()}, found ${found(c.text)}`
			);
			return null;
		}
		if (parsed.value < min) {
			problem(
				key,
				`expected ${label(key).toLowerCase()} of ${min} ${unit} or more, found ${parsed.value}${min === 0 ? ' (it cannot be negative)' : ''}`
			);
			return null;
		}
		if (parsed.value > max) {
			problem(
				key,
				`expected ${label(key).toLowerCase()} of at most ${max} ${unit}, found ${parsed.value}`
			);
			return null;
		}
		return parsed.value;
	};
	const date = (key: string): Date | null => {
		const text = required(key);
		if (text === null) return null;
		const parsed = parseDateCell(text, ctx.settings.dateFormat, ctx.timeZone);
		if (!parsed.ok) {
			problem(key, `expected ${parsed.expected}, found ${found(text)}`);
			return null;
		}
		if (parsed.value.getTime() > ctx.now.getTime() + FUTURE_TOLERANCE_MS) {
			problem(
				key,
				`${text} is in the future; only what has already happened can be imported (check the date order or the year)`
			);
			return null;
		}
		shown[key] = parsed.value.toISOString();
		return parsed.value;
	};
	const van = (): number | null => {
		const text = required('registration');
		if (text === null) return null;
		const ids = ctx.vans.get(normalRegistration(text)) ?? [];
		if (ids.length === 0) {
			problem(
				'registration',
				`no van “${text}” among the vans you can import for; check the registration, or add the van first`
			);
			return null;
		}
		if (ids.length > 1) {
			problem(
				'registration',
				`“${text}” matches vans in more than one fleet you work for; import each fleet's file separately`
			);
			return null;
		}
		shown.registration = normalRegistration(text);
		return ids[0];
	};
	const text = (key: string, max: number): string | null => {
		const c = cell(key);
		if (!c || c.text === '') return null;
		if (c.text.length > max) {
			problem(
				key,
				`expected at most ${max} characters for ${label(key).toLowerCase()}, found ${c.text.length}`
			);
			return null;
		}
		shown[key] = c.text;
		return c.text;
	};

	if (ctx.kind === 'readings') {
		const vehicleId = van();
		const takenAt = date('takenAt');
		let deltaPMbar: number | null = null;
		let rawVolts: number | null = null;
		const dp = required('deltaP');
		if (dp !== null) {
			const parsed = parseNumberCell(dp, ctx.decimalComma);
			if (!parsed.ok) problem('deltaP', `expected ${parsed.expected} for Δp, found ${found(dp)}`);
			else if (ctx.settings.unit === 'volts') {
				const circuit = checkCircuit(parsed.value, parsed.value, DEFAULT_CIRCUIT_LIMITS);
				if (circuit.level === 'fault') {
					problem(
						'deltaP',
						`expected a signal between ${DEFAULT_CIRCUIT_LIMITS.minVolts} and ${DEFAULT_CIRCUIT_LIMITS.maxVolts} V, found ${parsed.value} V: outside that band the sensor circuit is faulty, so it is not a pressure`
					);
				} else {
					rawVolts = parsed.value;
					deltaPMbar = voltsToMbar(parsed.value, ctx.sensor!);
				}
			} else {
				deltaPMbar = toMbar(parsed.value, ctx.settings.unit);
			}
			if (
				deltaPMbar !== null &&
				ctx.settings.unit !== 'volts' &&
				(deltaPMbar < DELTA_P_RANGE_MBAR.min || deltaPMbar > DELTA_P_RANGE_MBAR.max)
			) {
				problem(
					'deltaP',
					`expected Δp between ${DELTA_P_RANGE_MBAR.min} and ${DELTA_P_RANGE_MBAR.max} mbar, found ${parsed.ok ? parsed.value : dp} ${ctx.settings.unit}${deltaPMbar < 0 ? ' (it cannot be negative)' : ' (check the unit)'}`
				);
				deltaPMbar = null;
			}
			if (deltaPMbar !== null) shown.deltaP = `${deltaPMbar.toFixed(1)} mbar`;
		}
		let condition: TestCondition = ctx.settings.condition;
		const c = cell('condition');
		if (c && c.text !== '') {
			const word = CONDITION_WORDS[squash(c.text)];
			if (!word)
				problem(
					'condition',
					`expected idle, raised idle, road load or telemetry, found ${found(c.text)}`
				);
			else condition = word;
		}
		shown.condition = condition.replace('_', ' ');
		const odometerKm = number('odometerKm', 0, 3_000_000, 'km', true);
		if (odometerKm !== null) shown.odometerKm = `${odometerKm} km`;
		const rpm = number('rpm', 0, 8000, 'rpm', true);
		if (rpm !== null) shown.rpm = String(rpm);
		const ok =
			problems.length === 0 && vehicleId !== null && takenAt !== null && deltaPMbar !== null;
		return {
			line,
			problems,
			shown,
			row: ok
				? {
						vehicleId: vehicleId!,
						takenAt: takenAt!,
						deltaPMbar: deltaPMbar!,
						rawVolts,
						condition,
						odometerKm,
						rpm: rpm === null ? null : Math.round(rpm)
					}
				: null
		};
	}

	if (ctx.kind === 'trips') {
		const vehicleId = van();
		const startedAt = date('startedAt');
		const endedAt = date('endedAt');
		if (startedAt && endedAt && endedAt.getTime() <= startedAt.getTime()) {
			problem('endedAt', 'expected the end to come after the start');
		}
		const distanceKm = number('distanceKm', 0, 5000, 'km', false);
		if (cell('distanceKm') && distanceKm !== null) shown.distanceKm = `${distanceKm} km`;
		const idleMinutes = number('idleMinutes', 0, 24 * 60, 'minutes', true);
		const meanSpeedKmh = number('meanSpeedKmh', 0, 200, 'km/h', true);
		const ok =
			problems.length === 0 && vehicleId !== null && startedAt && endedAt && distanceKm !== null;
		return {
			line,
			problems,
			shown,
			row: ok
				? {
						vehicleId: vehicleId!,
						startedAt: startedAt!,
						endedAt: endedAt!,
						distanceKm: distanceKm!,
						idleMinutes: idleMinutes ?? 0,
						meanSpeedKmh
					}
				: null
		};
	}

	// Vans
	const registrationText = required('registration');
	let registration: string | null = null;
	if (registrationText !== null) {
		registration = normalRegistration(registrationText);
		if (!/^[A-Z0-9 -]{1,16}$/.test(registration)) {
			problem(
				'registration',
				`expected a registration of up to 16 letters, digits, spaces and dashes, found ${found(registrationText)}`
			);
			registration = null;
		} else shown.registration = registration;
	}
	const vinText = text('vin', 17);
	let vin: string | null = null;
	if (vinText !== null) {
		if (!/^[A-HJ-NPR-Z0-9]{17}$/i.test(vinText))
			problem(
				'vin',
				`expected a VIN of 17 letters and digits (no I, O or Q), found ${found(vinText)}`
			);
		else vin = vinText.toUpperCase();
	}
	let fuel: Fuel = 'en590_diesel';
	const fuelCell = cell('fuel');
	if (fuelCell && fuelCell.text !== '') {
		const word = FUEL_WORDS[squash(fuelCell.text)];
		if (!word)
			problem(
				'fuel',
				`expected diesel, biodiesel blend or HVO (paraffinic), found ${found(fuelCell.text)}`
			);
		else fuel = word;
	}
	let depotId: number | null = null;
	const depotCell = cell('depot');
	if (depotCell && depotCell.text !== '') {
		const id = ctx.depots.get(depotCell.text.toLowerCase());
		if (id === undefined) {
			const names = [...ctx.depots.keys()].map((n) => `“${n}”`).join(', ') || 'none yet';
			problem(
				'depot',
				`expected the name of one of the fleet's depots (${names}), found ${found(depotCell.text)}`
			);
		} else depotId = id;
	}
	const cc = number('engineDisplacementCc', 500, 10_000, 'cc', true);
	const row: VehicleRow | null =
		problems.length === 0 && registration
			? {
					registration,
					makeModel: text('makeModel', 120),
					vin,
					emissionClass: text('emissionClass', 16),
					fuel,
					oilGrade: text('oilGrade', 32),
					engineDisplacementCc: cc === null ? null : Math.round(cc),
					depotId
				}
			: null;
	return { line, problems, shown, row };
}
