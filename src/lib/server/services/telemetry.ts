/**
 * Readings and filter events sent by telematics units (or scripts) through /api/v1. Each
 * request is one batch: every item is checked first, then everything new is stored in one
 * transaction, or nothing is. Items already stored (same client id, or same van and time) are
 * reported as duplicates, never stored twice; an `Idempotency-Key` replays the first answer.
 */
import { Op } from 'sequelize';
import { IdempotencyKey, ImportBatch, Vehicle, VehicleEvent, getDb, serializeOn } from '../db';
import type { ApiUser } from './api-tokens';
import { vehicleScope } from './scope';
import { ConflictError, NotFoundError, ValidationError } from './errors';
import {
	existingReadingKeys,
	insertReadings,
	readingsTopic,
	vanTimeKey,
	type NewReadingRow
} from './reading-writes';
import { recordAudit } from './audit';
import {
	decodeAt1imgPayload,
	decodeObdPid7a,
	decodeSpn3251Raw,
	parseHexBytes,
	type DecodedDeltaP
} from '../../domain/telemetry';
import { toMbar } from '../../domain/units';
import type {
	BatchResult,
	DeltaPInput,
	EventsBatchInput,
	ReadingsBatchInput
} from '../../validation/telemetry';

/** Clock difference between a unit and the server that is still "now", ms. */
export const FUTURE_TOLERANCE_MS = 5 * 60_000;

export interface Idempotency {
	key: string;
	endpoint: string;
	requestHash: string;
}

export interface BatchAnswer {
	status: number;
	body: BatchResult;
	replayed: boolean;
}

/** Δp in mbar from any accepted encoding. */
export function deltaPToMbar(deltaP: DeltaPInput): DecodedDeltaP {
	switch (deltaP.format) {
		case 'mbar':
		case 'kPa':
		case 'psi':
			return { ok: true, mbar: toMbar(deltaP.value, deltaP.format) };
		case 'j1939_spn3251':
			return decodeSpn3251Raw(deltaP.raw);
		case 'j1939_pgn64946':
		case 'obd_pid_7a': {
			const bytes = parseHexBytes(deltaP.data);
			if (!bytes) return { ok: false, reason: 'the bytes are not hexadecimal pairs' };
			return deltaP.format === 'obd_pid_7a' ? decodeObdPid7a(bytes) : decodeAt1imgPayload(bytes);
		}
	}
}

type VanRef = { vehicleId?: number; registration?: string };
const normalRegistration = (r: string) => r.trim().toUpperCase().replace(/\s+/g, ' ');

/** The van each item names, all within the caller's reach; another fleet's van is a 404. */
async function resolveVans(user: ApiUser, items: VanRef[], listName: string): Promise<number[]> {
	const ids = [...new Set(items.flatMap((i) => (i.vehicleId !== undefined ? [i.vehicleId] : [])))];
	const regs = [
		...new Set(
			items.flatMap((i) =>
				i.registration !== undefined ? [normalRegistration(i.registration)] : []
			)
		)
	];
	const or = [];
	if (ids.length) or.push({ id: { [Op.in]: ids } });
	if (regs.length) or.push({ registration: { [Op.in]: regs } });
	const vans = await Vehicle.findAll({
		attributes: ['id', 'registration'],
		where: { [Op.and]: [await vehicleScope(user), { archivedAt: null }, { [Op.or]: or }] }
	});
	const byId = new Map(vans.map((v) => [v.id, v.id]));
	const byReg = new Map(vans.map((v) => [normalRegistration(v.registration), v.id]));
	return items.map((item, index) => {
		const found =
			item.vehicleId !== undefined
				? byId.get(item.vehicleId)
				: byReg.get(normalRegistration(item.registration ?? ''));
		if (found === undefined) {
			const named =
				item.vehicleId !== undefined ? `with id ${item.vehicleId}` : `“${item.registration}”`;
			throw new NotFoundError(
				`The van ${named} (${listName}[${index}]) among the vans you can send data for`
			);
		}
		return found;
	});
}

async function replayed(user: ApiUser, idem: Idempotency | undefined): Promise<BatchAnswer | null> {
	if (!idem) return null;
	const row = await IdempotencyKey.findOne({
		where: { organisationId: user.organisationId, key: idem.key }
	});
	if (!row) return null;
	if (row.requestHash !== idem.requestHash || row.endpoint !== idem.endpoint) {
		throw new ConflictError(
			'This Idempotency-Key was already used for a different request; use a new key for new data.'
		);
	}
	return {
		status: row.statusCode,
		body: JSON.parse(row.responseBody) as BatchResult,
		replayed: true
	};
}

async function remember(
	user: ApiUser,
	idem: Idempotency | undefined,
	answer: BatchAnswer,
	now: Date
) {
	if (!idem) return;
	await IdempotencyKey.create({
		organisationId: user.organisationId,
		key: idem.key,
		endpoint: idem.endpoint,
		requestHash: idem.requestHash,
		statusCode: answer.status,
		responseBody: JSON.stringify(answer.body),
		createdAt: now
	});
}

const batchName = (user: ApiUser) =>
	(user.apiTokenId ? `API: ${user.name}` : `API: ${user.name} (signed in)`).slice(0, 255);

/** Stores a batch of readings; see the module comment for the rules. */
export async function recordReadingBatch(
	user: ApiUser,
	input: ReadingsBatchInput,
	idem: Idempotency | undefined,
	now = new Date()
): Promise<BatchAnswer> {
	const fields: Record<string, string> = {};
	const decoded = input.readings.map((r, i) => {
		const result = deltaPToMbar(r.deltaP);
		if (!result.ok) fields[`readings.${i}.deltaP`] ??= `Δp cannot be read: ${result.reason}.`;
		const takenAt = new Date(r.takenAt);
		if (takenAt.getTime() > now.getTime() + FUTURE_TOLERANCE_MS) {
			fields[`readings.${i}.takenAt`] ??=
				`takenAt ${r.takenAt} is in the future; a reading must already have been taken.`;
		}
		return { takenAt, mbar: result.ok ? result.mbar : NaN };
	});
	if (Object.keys(fields).length) {
		const [firstField, firstMessage] = Object.entries(fields)[0];
		throw new ValidationError(`${firstField}: ${firstMessage}`, fields);
	}
	return getDb().transaction(async () => {
		// One writer of a fleet's readings at a time, so duplicate and key checks hold.
		await serializeOn(getDb(), readingsTopic(user.organisationId));
		const replay = await replayed(user, idem);
		if (replay) return replay;
		const vanIds = await resolveVans(user, input.readings, 'readings');
		const spans = new Map<number, { from: Date; to: Date }>();
		const clientIds = new Map<number, string[]>();
		input.readings.forEach((r, i) => {
			const vid = vanIds[i];
			const t = decoded[i].takenAt;
			const span = spans.get(vid);
			if (!span) spans.set(vid, { from: t, to: t });
			else {
				if (t < span.from) span.from = t;
				if (t > span.to) span.to = t;
			}
			if (r.clientReadingId) clientIds.set(vid, [...(clientIds.get(vid) ?? []), r.clientReadingId]);
		});
		const existing = await existingReadingKeys(spans, clientIds);
		const duplicates: BatchResult['duplicates'] = [];
		const rows: NewReadingRow[] = [];
		input.readings.forEach((r, i) => {
			const vid = vanIds[i];
			const timeKey = vanTimeKey(vid, decoded[i].takenAt);
			const idKey = r.clientReadingId ? `${vid}|${r.clientReadingId}` : null;
			if (idKey && existing.clientIds.has(idKey)) {
				duplicates.push({
					index: i,
					reason: `clientReadingId “${r.clientReadingId}” is already stored for this van`
				});
				return;
			}
			if (existing.times.has(timeKey)) {
				duplicates.push({
					index: i,
					reason: 'a reading for this van at this time is already stored'
				});
				return;
			}
			existing.times.add(timeKey);
			if (idKey) existing.clientIds.add(idKey);
			rows.push({
				vehicleId: vid,
				takenAt: decoded[i].takenAt,
				deltaPMbar: decoded[i].mbar,
				condition: r.condition,
				source: 'api',
				odometerKm: r.odometerKm,
				rpm: r.rpm,
				airMassFlowKgH: r.airMassFlowKgH,
				exhaustTempC: r.exhaustTempC,
				ambientPressureKpa: r.ambientPressureKpa,
				authorId: user.id,
				clientReadingId: r.clientReadingId ?? null
			});
		});
		let batchId: number | null = null;
		if (rows.length) {
			const batch = await ImportBatch.create({
				organisationId: user.organisationId,
				kind: 'readings',
				fileName: batchName(user),
				rowCount: rows.length,
				createdById: user.id,
				createdAt: now,
				updatedAt: now
			});
			batchId = batch.id;
			for (const row of rows) row.importBatchId = batch.id;
			await insertReadings(rows, now);
			await recordAudit(
				user,
				'readings.api',
				'import_batch',
				batch.id,
				{ stored: rows.length, token: user.apiTokenId },
				now
			);
		}
		const answer: BatchAnswer = {
			status: rows.length ? 201 : 200,
			body: { batchId, stored: rows.length, duplicates },
			replayed: false
		};
		await remember(user, idem, answer, now);
		return answer;
	});
}

/** Stores a batch of filter events (regenerations, cleaning, replacement, repairs). */
export async function recordEventBatch(
	user: ApiUser,
	input: EventsBatchInput,
	idem: Idempotency | undefined,
	now = new Date()
): Promise<BatchAnswer> {
	const fields: Record<string, string> = {};
	const times = input.events.map((e, i) => {
		const at = new Date(e.occurredAt);
		if (at.getTime() > now.getTime() + FUTURE_TOLERANCE_MS) {
			fields[`events.${i}.occurredAt`] ??= `occurredAt ${e.occurredAt} is in the future.`;
		}
		return at;
	});
	if (Object.keys(fields).length) {
		const [firstField, firstMessage] = Object.entries(fields)[0];
		throw new ValidationError(`${firstField}: ${firstMessage}`, fields);
	}
	return getDb().transaction(async () => {
		// One writer of a fleet's readings at a time, so duplicate and key checks hold.
		await serializeOn(getDb(), readingsTopic(user.organisationId));
		const replay = await replayed(user, idem);
		if (replay) return replay;
		const vanIds = await resolveVans(user, input.events, 'events');
		const vans = [...new Set(vanIds)];
		const from = new Date(Math.min(...times.map((t) => t.getTime())));
		const to = new Date(Math.max(...times.map((t) => t.getTime())));
		const clientIds = input.events.flatMap((e) => (e.clientEventId ? [e.clientEventId] : []));
		const existing = await VehicleEvent.findAll({
			attributes: ['vehicleId', 'occurredAt', 'kind', 'clientEventId'],
			where: {
				vehicleId: { [Op.in]: vans },
				[Op.or]: [
					{ occurredAt: { [Op.between]: [from, to] } },
					...(clientIds.length ? [{ clientEventId: { [Op.in]: clientIds } }] : [])
				]
			}
		});
		const seen = new Set(
			existing.map((e) => `${e.vehicleId}|${new Date(e.occurredAt).getTime()}|${e.kind}`)
		);
		const seenIds = new Set(
			existing.filter((e) => e.clientEventId).map((e) => `${e.vehicleId}|${e.clientEventId}`)
		);
		const duplicates: BatchResult['duplicates'] = [];
		const rows: {
			vehicleId: number;
			occurredAt: Date;
			kind: (typeof input.events)[number]['kind'];
			odometerKm: number | null;
			notes: string | null;
			source: string;
			authorId: number;
			clientEventId: string | null;
		}[] = [];
		input.events.forEach((e, i) => {
			const vid = vanIds[i];
			const idKey = e.clientEventId ? `${vid}|${e.clientEventId}` : null;
			const key = `${vid}|${times[i].getTime()}|${e.kind}`;
			if (idKey && seenIds.has(idKey)) {
				duplicates.push({
					index: i,
					reason: `clientEventId “${e.clientEventId}” is already stored for this van`
				});
				return;
			}
			if (seen.has(key)) {
				duplicates.push({
					index: i,
					reason: 'the same event for this van at this time is already stored'
				});
				return;
			}
			seen.add(key);
			if (idKey) seenIds.add(idKey);
			rows.push({
				vehicleId: vid,
				occurredAt: times[i],
				kind: e.kind,
				odometerKm: e.odometerKm ?? null,
				notes: e.notes ?? null,
				source: 'api',
				authorId: user.id,
				clientEventId: e.clientEventId ?? null
			});
		});
		let batchId: number | null = null;
		if (rows.length) {
			const batch = await ImportBatch.create({
				organisationId: user.organisationId,
				kind: 'events',
				fileName: batchName(user),
				rowCount: rows.length,
				createdById: user.id,
				createdAt: now,
				updatedAt: now
			});
			batchId = batch.id;
			await VehicleEvent.bulkCreate(rows.map((r) => ({ ...r, importBatchId: batch.id })));
			await recordAudit(
				user,
				'events.api',
				'import_batch',
				batch.id,
				{ stored: rows.length, token: user.apiTokenId },
				now
			);
		}
		const answer: BatchAnswer = {
			status: rows.length ? 201 : 200,
			body: { batchId, stored: rows.length, duplicates },
			replayed: false
		};
		await remember(user, idem, answer, now);
		return answer;
	});
}
