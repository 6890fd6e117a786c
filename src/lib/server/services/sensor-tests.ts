/**
 * Sensor tests on a van: static tests from an uploaded voltage capture (streamed to storage,
 * analysed by the engine in bounded memory) and vacuum range checks entered step by step.
 * Results are saved on the van; a static test's idle Δp joins the van's readings.
 */
import { Op } from 'sequelize';
import { Reading, SensorTest, SensorType, Upload, Vehicle, getDb } from '../db';
import type { SessionUser } from '../auth/lucia';
import { config } from '../config';
import {
	createFileWriter,
	FileTooLargeError,
	formatBytes,
	newKey,
	openRead,
	removingOnBreak
} from '../storage';
import { notTextMessage, sniffContent, type Sniffed } from '../storage/sniff';
import { ForbiddenError, NotFoundError, PayloadTooLargeError, ValidationError } from './errors';
import { vehicleScope } from './scope';
import { findVisibleVehicle } from './vehicles';
import { recordAudit } from './audit';
import { insertReadings } from './reading-writes';
import { readTrace, saveTrace, type TraceBucket } from './capture-trace';
import {
	createCaptureParser,
	CaptureParseError,
	type CaptureParseInfo
} from '../../domain/capture/parser';
import { MinMaxPyramid } from '../../domain/capture/pyramid';
import { detectPhases, STATIC_PHASES, type PhaseBoundaries } from '../../domain/capture/phases';
import { CaptureSummary } from '../../domain/capture/summary';
import { judgeStaticTest, type StaticTestReport } from '../../domain/static-test';
import { runVacuumCheck, type VacuumCheckReport } from '../../domain/vacuum-check';
import { DEFAULT_SENSOR, mbarPerVolt, type SensorType as SensorCurve } from '../../domain/sensor';
import type { VacuumCheckInput } from '../../validation/sensor-tests';

export interface SensorInfo extends SensorCurve {
	name: string;
}

export interface StaticTestResult {
	fileName: string;
	capture: Pick<
		CaptureParseInfo,
		'sampleCount' | 'firstTimeS' | 'lastTimeS' | 'timeColumn' | 'voltsColumn' | 'timeUnit'
	>;
	sensor: SensorInfo;
	traceKey: string;
	bucketWidthS: number;
	detected: { phases: PhaseBoundaries; notes: string[] };
	report: StaticTestReport;
	/** The idle Δp added to the van's readings, or why none was. */
	derived: { deltaPMbar: number | null; note: string };
}

export interface VacuumTestResult {
	sensor: SensorInfo;
	report: VacuumCheckReport;
}

const DEFAULT_SENSOR_INFO: SensorInfo = {
	name: 'Default Δp sensor, 0.5–4.5 V for 0–1000 mbar',
	...DEFAULT_SENSOR
};
const derivedReadingId = (testId: number) => `sensor-test-${testId}-idle`;

function assertWorkshop(user: SessionUser): void {
	if (user.role !== 'workshop') throw new ForbiddenError('Sensor tests are recorded by workshops.');
}

async function sensorFor(vehicle: Vehicle, sensorTypeId?: number): Promise<SensorInfo> {
	const id = sensorTypeId ?? vehicle.sensorTypeId;
	if (!id) return DEFAULT_SENSOR_INFO;
	const row = await SensorType.findByPk(id);
	if (!row)
		throw new ValidationError('Choose a sensor type from the list.', {
			sensorTypeId: 'Choose a sensor type from the list'
		});
	return {
		name: row.name,
		zeroVolts: row.zeroVolts,
		fullScaleVolts: row.fullScaleVolts,
		fullScaleMbar: row.fullScaleMbar
	};
}

/** Second pass over the stored capture: per-phase statistics for these phases, then the verdicts. */
async function judgeCapture(
	key: string,
	phases: PhaseBoundaries,
	sensor: SensorInfo,
	source: 'technician' | 'detected',
	notes: string[]
) {
	const summary = new CaptureSummary({ phases, pyramid: false });
	const parser = createCaptureParser({ onSample: (t, v) => summary.add(t, v) });
	const decoder = new TextDecoder('utf-8');
	for await (const chunk of openRead(key, undefined))
		parser.push(decoder.decode(chunk as Buffer, { stream: true }));
	parser.push(decoder.decode());
	parser.end();
	const result = summary.result();
	return judgeStaticTest(result.phases, {
		overall: result.overall,
		sensor,
		boundaries: phases,
		phaseSource: source,
		notes
	});
}

/** The idle mean as a reading, unless the checks say the levels cannot be trusted. */
function derivedReading(report: StaticTestReport): {
	deltaPMbar: number | null;
	volts: number | null;
	note: string;
} {
	const idle = report.phases.idle;
	if (!idle)
		return {
			deltaPMbar: null,
			volts: null,
			note: 'No idle phase, so no reading was added to the van.'
		};
	const untrusted = report.checks.find(
		(c) => (c.check === 'circuit' || c.check === 'pipe-leak') && c.level === 'fault'
	);
	if (untrusted) {
		return {
			deltaPMbar: null,
			volts: null,
			note: `No reading was added: the ${untrusted.check === 'circuit' ? 'circuit' : 'pipe'} check failed, so the idle level cannot be trusted.`
		};
	}
	return {
		deltaPMbar: idle.mbar.mean,
		volts: idle.volts.mean,
		note: 'The idle mean Δp was added to the van’s readings (condition: idle).'
	};
}

async function replaceDerivedReading(
	test: SensorTest,
	report: StaticTestReport,
	user: SessionUser,
	now: Date
) {
	await Reading.destroy({
		where: { vehicleId: test.vehicleId, clientReadingId: derivedReadingId(test.id) }
	});
	const derived = derivedReading(report);
	if (derived.deltaPMbar !== null) {
		await insertReadings(
			[
				{
					vehicleId: test.vehicleId,
					takenAt: new Date(test.testedAt),
					deltaPMbar: derived.deltaPMbar,
					rawVolts: derived.volts,
					condition: 'idle',
					source: 'capture',
					authorId: user.id,
					clientReadingId: derivedReadingId(test.id)
				}
			],
			now
		);
	}
	return { deltaPMbar: derived.deltaPMbar, note: derived.note };
}

/**
 * Streams a capture CSV to storage while parsing it and building the chart pyramid, then
 * judges it with automatically found phases. Memory stays bounded whatever the file's size.
 * @throws ValidationError naming line and column for a capture that cannot be read
 */
export async function uploadStaticCapture(
	user: SessionUser,
	vehicleId: number,
	file: { fileName: string; body: AsyncIterable<Uint8Array> },
	options: { testedAt?: Date; sensorTypeId?: number } = {},
	now = new Date()
): Promise<{ testId: number; verdict: string }> {
	assertWorkshop(user);
	const vehicle = await findVisibleVehicle(user, vehicleId);
	const fileName = file.fileName.replace(/[\\/]/g, '_').slice(0, 255) || 'capture.csv';
	const key = newKey(user.organisationId, 'csv', now);
	const writer = await createFileWriter(key, { maxBytes: config.CAPTURE_MAX_BYTES });
	const pyramid = new MinMaxPyramid();
	const parser = createCaptureParser({ onSample: (t, v) => pyramid.add(t, v) });
	const decoder = new TextDecoder('utf-8');
	let failure: Error | null = null;
	// Until the first 8 KiB have been sniffed, chunks wait here: a PDF must not reach the parser
	let pending: Uint8Array[] = [];
	const feed = (chunk: Uint8Array, sniffed: Sniffed | null) => {
		const refusal = sniffed && notTextMessage(sniffed, fileName);
		if (refusal) throw new ValidationError(refusal, { file: refusal });
		parser.push(decoder.decode(chunk, { stream: true }));
	};
	for await (const chunk of removingOnBreak(file.body, writer)) {
		if (failure) continue; // read and drop the rest, so the answer still reaches the sender
		try {
			await writer.write(chunk);
			if (writer.sniffed === null) pending.push(chunk);
			else {
				for (const waiting of pending) feed(waiting, writer.sniffed);
				pending = [];
				feed(chunk, writer.sniffed);
			}
		} catch (err) {
			failure = err as Error;
			await writer.abort();
		}
	}
	let info: CaptureParseInfo | undefined;
	if (!failure) {
		try {
			if (pending.length || writer.sizeBytes === 0) {
				const refusal = notTextMessage(sniffContent(Buffer.concat(pending), true), fileName);
				if (refusal) throw new ValidationError(refusal, { file: refusal });
				for (const waiting of pending) feed(waiting, null);
			}
			parser.push(decoder.decode());
			info = parser.end();
		} catch (err) {
			failure = err as Error;
			await writer.abort();
		}
	}
	if (failure) {
		if (failure instanceof FileTooLargeError) {
			throw new PayloadTooLargeError(
				`“${fileName}” is larger than the ${formatBytes(config.CAPTURE_MAX_BYTES)} a capture may be.`
			);
		}
		if (failure instanceof CaptureParseError) {
			throw new ValidationError(`“${fileName}”: ${failure.message}.`, { file: failure.message });
		}
		throw failure;
	}
	const stored = await writer.finish();
	const sensor = await sensorFor(vehicle, options.sensorTypeId);
	const detection = detectPhases(pyramid.windows(0.2));
	const trace = await saveTrace(`${stored.key}.trace`, pyramid);
	const report = await judgeCapture(
		stored.key,
		detection.phases,
		sensor,
		'detected',
		detection.notes
	);
	const testedAt = options.testedAt ?? now;
	const test = await getDb().transaction(async () => {
		const upload = await Upload.create({
			organisationId: user.organisationId,
			ownerId: user.id,
			vehicleId: vehicle.id,
			name: fileName,
			contentType: 'text/csv; charset=utf-8',
			sizeBytes: stored.sizeBytes,
			sha256: stored.sha256,
			storagePath: stored.key,
			createdAt: now,
			updatedAt: now
		});
		const row = await SensorTest.create({
			vehicleId: vehicle.id,
			kind: 'static',
			uploadId: upload.id,
			authorId: user.id,
			testedAt,
			verdict: report.overall.level,
			result: {},
			createdAt: now,
			updatedAt: now
		});
		const derived = await replaceDerivedReading(row, report, user, now);
		const result: StaticTestResult = {
			fileName,
			capture: {
				sampleCount: info!.sampleCount,
				firstTimeS: info!.firstTimeS,
				lastTimeS: info!.lastTimeS,
				timeColumn: info!.timeColumn,
				voltsColumn: info!.voltsColumn,
				timeUnit: info!.timeUnit
			},
			sensor,
			traceKey: `${stored.key}.trace`,
			bucketWidthS: trace.bucketWidthS,
			detected: { phases: detection.phases, notes: detection.notes },
			report,
			derived
		};
		await row.update({ result: result as unknown as Record<string, unknown> });
		await recordAudit(
			user,
			'sensor_test.static',
			'sensor_test',
			row.id,
			{ vehicleId: vehicle.id, uploadId: upload.id, verdict: report.overall.level },
			now
		);
		return row;
	});
	return { testId: test.id, verdict: report.overall.level };
}

/** A test on a van this person may see, or NotFoundError. */
async function findVisibleTest(
	user: SessionUser,
	testId: number
): Promise<SensorTest & { vehicle: Vehicle }> {
	const test = await SensorTest.findOne({
		where: { id: testId },
		include: [
			{
				model: Vehicle,
				as: 'vehicle',
				where: await vehicleScope(user),
				required: true,
				attributes: ['id', 'registration', 'sensorTypeId']
			}
		]
	});
	if (!test) throw new NotFoundError('That sensor test');
	return test as SensorTest & { vehicle: Vehicle };
}

export async function getSensorTest(user: SessionUser, testId: number) {
	const test = await findVisibleTest(user, testId);
	return {
		id: test.id,
		kind: test.kind,
		verdict: test.verdict,
		testedAt: new Date(test.testedAt).toISOString(),
		uploadId: test.uploadId ?? null,
		vehicle: { id: test.vehicle.id, registration: test.vehicle.registration },
		result: test.result as unknown as StaticTestResult | VacuumTestResult
	};
}

/** Judges a static test again with the technician's phases (or the detected ones for null). */
export async function rejudgeStaticTest(
	user: SessionUser,
	testId: number,
	phases: PhaseBoundaries | null,
	now = new Date()
) {
	assertWorkshop(user);
	const test = await findVisibleTest(user, testId);
	if (test.kind !== 'static') throw new NotFoundError('That static test');
	const result = test.result as unknown as StaticTestResult;
	const upload = await Upload.findByPk(test.uploadId ?? 0);
	if (!upload) throw new NotFoundError('The capture file of this test');
	for (const phase of STATIC_PHASES) {
		const span = phases?.[phase];
		if (span && !(span.endS > span.startS)) {
			throw new ValidationError('Each phase must end after it starts.', {
				[`${phase}.endS`]: 'The end must come after the start'
			});
		}
	}
	const chosen = phases ?? result.detected.phases;
	const report = await judgeCapture(
		upload.storagePath,
		chosen,
		result.sensor,
		phases ? 'technician' : 'detected',
		phases ? [] : result.detected.notes
	);
	await getDb().transaction(async () => {
		const derived = await replaceDerivedReading(test, report, user, now);
		await test.update({
			verdict: report.overall.level,
			result: { ...result, report, derived } as unknown as Record<string, unknown>
		});
		await recordAudit(
			user,
			'sensor_test.rejudge',
			'sensor_test',
			test.id,
			{ phases: chosen, verdict: report.overall.level },
			now
		);
	});
	return { verdict: report.overall.level };
}

/** Decimated trace of a static test's capture for [fromS, toS], volts and Δp. */
export async function sensorTestTrace(
	user: SessionUser,
	testId: number,
	range: { fromS?: number; toS?: number; points: number }
) {
	const test = await findVisibleTest(user, testId);
	if (test.kind !== 'static') throw new NotFoundError('That static test');
	const result = test.result as unknown as StaticTestResult;
	const fromS = range.fromS ?? result.capture.firstTimeS;
	const toS = range.toS ?? result.capture.lastTimeS;
	if (!(toS > fromS))
		throw new ValidationError('The range must end after it starts.', { to: 'Must be after from' });
	const { info, buckets } = await readTrace(result.traceKey, fromS, toS, range.points);
	const k = mbarPerVolt(result.sensor);
	const toMbar = (v: number) => (v - result.sensor.zeroVolts) * k;
	return {
		fromS,
		toS,
		bucketWidthS: info.bucketWidthS,
		buckets: buckets.map((b: TraceBucket) => ({
			startS: b.startS,
			endS: b.endS,
			count: b.count,
			minVolts: b.min,
			meanVolts: b.mean,
			maxVolts: b.max,
			meanMbar: toMbar(b.mean)
		}))
	};
}

/** Records a vacuum range check entered step by step. */
export async function recordVacuumCheck(
	user: SessionUser,
	vehicleId: number,
	input: VacuumCheckInput,
	now = new Date()
) {
	assertWorkshop(user);
	const vehicle = await findVisibleVehicle(user, vehicleId);
	const sensor = await sensorFor(vehicle, input.sensorTypeId);
	const report = runVacuumCheck(input.steps, sensor);
	const row = await getDb().transaction(async () => {
		const created = await SensorTest.create({
			vehicleId: vehicle.id,
			kind: 'vacuum',
			authorId: user.id,
			testedAt: input.testedAt ?? now,
			verdict: report.overall.level,
			result: { sensor, report } as unknown as Record<string, unknown>,
			createdAt: now,
			updatedAt: now
		});
		await recordAudit(
			user,
			'sensor_test.vacuum',
			'sensor_test',
			created.id,
			{ vehicleId: vehicle.id, verdict: report.overall.level },
			now
		);
		return created;
	});
	return { testId: row.id, verdict: report.overall.level, passed: report.passed };
}

export interface SensorTestListItem {
	id: number;
	kind: 'static' | 'vacuum';
	verdict: string;
	testedAt: string;
	summary: string;
	uploadId: number | null;
}

/** The tests on one van, newest first. */
export async function listSensorTests(
	user: SessionUser,
	vehicleId: number
): Promise<SensorTestListItem[]> {
	await findVisibleVehicle(user, vehicleId);
	const rows = await SensorTest.findAll({
		where: { vehicleId },
		order: [['testedAt', 'DESC']],
		limit: 50
	});
	return rows.map((t) => {
		const result = t.result as unknown as Partial<StaticTestResult & VacuumTestResult>;
		return {
			id: t.id,
			kind: t.kind,
			verdict: t.verdict,
			testedAt: new Date(t.testedAt).toISOString(),
			summary: result.report?.overall.reason ?? '',
			uploadId: t.uploadId ?? null
		};
	});
}

export async function sensorTypeChoices(): Promise<{ id: number; name: string }[]> {
	return (await SensorType.findAll({ attributes: ['id', 'name'], order: [['name', 'ASC']] })).map(
		(s) => ({ id: s.id, name: s.name })
	);
}

/**
 * An uploaded file, for download: the uploading organisation may fetch it, and so may anyone
 * who can see the van it belongs to. Anyone else gets a 404.
 */
export async function openUploadForDownload(user: SessionUser, uploadId: number) {
	const scope = await vehicleScope(user);
	const visibleVans = Vehicle.findAll({ attributes: ['id'], where: scope });
	const upload = await Upload.findOne({ where: { id: uploadId } });
	if (!upload) throw new NotFoundError('That file');
	const own = upload.organisationId === user.organisationId;
	const viaVan =
		upload.vehicleId !== null && (await visibleVans).some((v) => v.id === upload.vehicleId);
	if (!own && !viaVan) throw new NotFoundError('That file');
	return {
		name: upload.name,
		contentType: upload.contentType,
		sizeBytes: Number(upload.sizeBytes),
		sha256: upload.sha256,
		stream: () => openRead(upload.storagePath)
	};
}

export { Op };
