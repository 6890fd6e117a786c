/**
 * Bulk writes shared by CSV imports, the telemetry API and capture analysis. Rows go in as
 * multi-row INSERTs through the query interface (portable SQL, no model instance per row), so
 * a 100,000-row import stays within a small factor of raw inserts.
 */
import { Op } from 'sequelize';
import { Reading, getDb } from '../db';
import type { ReadingSource, TestCondition } from '../../domain/vocabulary';

export interface NewReadingRow {
	vehicleId: number;
	takenAt: Date;
	deltaPMbar: number;
	condition: TestCondition;
	source: ReadingSource;
	odometerKm?: number | null;
	rawVolts?: number | null;
	rpm?: number | null;
	airMassFlowKgH?: number | null;
	exhaustTempC?: number | null;
	ambientPressureKpa?: number | null;
	importBatchId?: number | null;
	authorId?: number | null;
	clientReadingId?: string | null;
}

/** Rows per INSERT statement: well under SQLite's 32,766 bound parameters at 16 columns. */
const CHUNK_ROWS = 1000;

/** Inserts rows in chunks; call inside a transaction so they land together. */
export async function insertReadings(rows: NewReadingRow[], now: Date): Promise<void> {
	const qi = getDb().getQueryInterface();
	for (let start = 0; start < rows.length; start += CHUNK_ROWS) {
		const chunk = rows.slice(start, start + CHUNK_ROWS).map((r) => ({
			vehicle_id: r.vehicleId,
			taken_at: r.takenAt,
			odometer_km: r.odometerKm ?? null,
			delta_p_mbar: r.deltaPMbar,
			raw_volts: r.rawVolts ?? null,
			condition: r.condition,
			rpm: r.rpm ?? null,
			air_mass_flow_kg_h: r.airMassFlowKgH ?? null,
			exhaust_temp_c: r.exhaustTempC ?? null,
			ambient_pressure_kpa: r.ambientPressureKpa ?? null,
			source: r.source,
			import_batch_id: r.importBatchId ?? null,
			author_id: r.authorId ?? null,
			client_reading_id: r.clientReadingId ?? null,
			created_at: now,
			updated_at: now
		}));
		await qi.bulkInsert('readings', chunk);
	}
}

/** "vehicleId|epoch ms": the key for "same van and time". */
export const vanTimeKey = (vehicleId: number, at: Date | string) =>
	`${vehicleId}|${new Date(at).getTime()}`;

/**
 * Which (van, time) pairs and client reading ids are already stored, for the vans and time
 * span given. One query per van keeps each one on the (vehicle_id, taken_at) index.
 */
export async function existingReadingKeys(
	spans: Map<number, { from: Date; to: Date }>,
	clientIds: Map<number, string[]> = new Map()
): Promise<{ times: Set<string>; clientIds: Set<string> }> {
	const times = new Set<string>();
	const ids = new Set<string>();
	for (const [vehicleId, span] of spans) {
		const rows = (await Reading.findAll({
			attributes: ['takenAt'],
			where: { vehicleId, takenAt: { [Op.between]: [span.from, span.to] } },
			raw: true
		})) as unknown as { takenAt: string | Date }[];
		for (const r of rows) times.add(vanTimeKey(vehicleId, r.takenAt));
	}
	for (const [vehicleId, list] of clientIds) {
		if (list.length === 0) continue;
		const rows = await Reading.findAll({
			attributes: ['clientReadingId'],
			where: { vehicleId, clientReadingId: { [Op.in]: list } },
			raw: true
		});
		for (const r of rows) ids.add(`${vehicleId}|${r.clientReadingId}`);
	}
	return { times, clientIds: ids };
}

/** The serializeOn topic of everything that writes a fleet's readings, events or vans. */
export const readingsTopic = (organisationId: number) => `fleet-writes:${organisationId}`;
