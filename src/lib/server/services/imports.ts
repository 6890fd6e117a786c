/**
 * CSV imports of readings, trips and vans: upload (stored, sniffed) → column mapping (kept per
 * organisation) → preview of the first rows → import. The whole file is checked before
 * anything is stored; then every row lands in one transaction as one batch, or none does.
 * Rows already stored (same van and time; for vans, the same registration) are reported, not
 * doubled. A batch can be undone.
 */
import { parse } from 'csv-parse';
import { Op } from 'sequelize';
import {
	ColumnMapping,
	Depot,
	ImportBatch,
	Organisation,
	Reading,
	SensorType,
	Trip,
	Upload,
	User,
	Vehicle,
	VehicleEvent,
	getDb,
	serializeOn
} from '../db';
import type { SessionUser } from '../auth/lucia';
import { config } from '../config';
import {
	createFileWriter,
	FileTooLargeError,
	formatBytes,
	newKey,
	openRead,
	readRange,
	removeFile,
	removingOnBreak
} from '../storage';
import { notTextMessage } from '../storage/sniff';
import { contractedFleetIds, vehicleScope } from './scope';
import {
	describeProblem,
	ForbiddenError,
	ImportError,
	NotFoundError,
	PayloadTooLargeError,
	ValidationError,
	type FileProblem
} from './errors';
import { recordAudit } from './audit';
import {
	checkRecord,
	normalRegistration,
	type ReadingRow,
	type RowContext,
	type TripRow,
	type VehicleRow
} from './import-rows';
import { existingReadingKeys, insertReadings, readingsTopic, vanTimeKey } from './reading-writes';
import {
	IMPORT_FIELDS,
	IMPORT_UNITS,
	importSettingsSchema,
	type ImportKind,
	type ImportSettingsInput
} from '../../validation/imports';

/** Problems listed at most; the count says how many more there were. */
const MAX_PROBLEMS = 50;
const PREVIEW_ROWS = 20;
const HEAD_BYTES = 64 * 1024;
const SEPARATORS = [',', ';', '\t'] as const;
type Separator = (typeof SEPARATORS)[number];
const SEPARATOR_NAME: Record<string, string> = {
	',': 'commas',
	';': 'semicolons',
	'\t': 'tabs',
	'|': 'vertical bars (|)'
};

function assertImporter(user: SessionUser): void {
	if (user.role !== 'fleet_manager' && user.role !== 'workshop') {
		throw new ForbiddenError('Imports are for fleet managers and workshops.');
	}
}

/** Streams an uploaded file into storage; refuses empty, binary and oversized files. */
export async function stageImportFile(
	user: SessionUser,
	input: { fileName: string; body: AsyncIterable<Uint8Array> },
	now = new Date()
): Promise<{ uploadId: number; fileName: string; sizeBytes: number }> {
	assertImporter(user);
	const fileName = input.fileName.replace(/[\\/]/g, '_').slice(0, 255) || 'import.csv';
	const key = newKey(user.organisationId, 'csv', now);
	const writer = await createFileWriter(key, { maxBytes: config.IMPORT_MAX_BYTES });
	let tooLarge = false;
	for await (const chunk of removingOnBreak(input.body, writer)) {
		if (tooLarge) continue; // read the rest and drop it, so the answer still reaches the sender
		try {
			await writer.write(chunk);
		} catch (err) {
			if (!(err instanceof FileTooLargeError)) {
				await writer.abort();
				throw err;
			}
			tooLarge = true;
		}
	}
	if (tooLarge) {
		throw new PayloadTooLargeError(
			`“${fileName}” is larger than the ${formatBytes(config.IMPORT_MAX_BYTES)} an import takes. Split it into smaller files and import each.`
		);
	}
	const stored = await writer.finish();
	const refusal = notTextMessage(stored.sniffed, fileName);
	if (refusal) {
		await removeFile(key);
		throw new ValidationError(refusal, { file: refusal });
	}
	const encoding = stored.sniffed.kind === 'text' ? stored.sniffed.encoding : 'utf-8';
	const upload = await Upload.create({
		organisationId: user.organisationId,
		ownerId: user.id,
		name: fileName,
		contentType: `text/csv; charset=${encoding}`,
		sizeBytes: stored.sizeBytes,
		sha256: stored.sha256,
		storagePath: stored.key,
		createdAt: now,
		updatedAt: now
	});
	await recordAudit(
		user,
		'import.upload',
		'upload',
		upload.id,
		{ name: fileName, sizeBytes: stored.sizeBytes, sha256: stored.sha256 },
		now
	);
	return { uploadId: upload.id, fileName, sizeBytes: stored.sizeBytes };
}

async function findImportUpload(user: SessionUser, uploadId: number): Promise<Upload> {
	const upload = await Upload.findOne({
		where: {
			id: uploadId,
			organisationId: user.organisationId,
			vehicleId: null,
			contentType: { [Op.like]: 'text/csv%' }
		}
	});
	if (!upload) throw new NotFoundError('That uploaded file');
	return upload;
}

interface Layout {
	separator: string;
	header: string[];
	sample: string[][];
	encoding: BufferEncoding;
}

function splitOutsideQuotes(line: string, separator: string): number {
	let count = 0;
	let quoted = false;
	for (const ch of line) {
		if (ch === '"') quoted = !quoted;
		else if (!quoted && ch === separator) count += 1;
	}
	return count;
}

/** Separator, header and first rows, read from the head of the file. */
async function readLayout(upload: Upload): Promise<Layout> {
	const encoding: BufferEncoding = upload.contentType.includes('windows-1252') ? 'latin1' : 'utf8';
	const head = (await readRange(upload.storagePath, 0, HEAD_BYTES))
		.toString(encoding)
		.replace(/^\uFEFF/, '');
	const lines = head.split(/\r?\n/);
	const headerLine = lines.find((l) => l.trim() !== '') ?? '';
	if (headerLine === '') {
		throw new ImportError([
			{
				line: 1,
				column: 1,
				message: 'the file holds only blank lines: expected a header row naming the columns'
			}
		]);
	}
	const counts = SEPARATORS.map((s) => splitOutsideQuotes(headerLine, s));
	const best = Math.max(...counts);
	let separator: Separator = ',';
	if (best > 0) separator = SEPARATORS[counts.indexOf(best)];
	else {
		const other = ['|', '^', '~'].find((s) => headerLine.includes(s));
		if (other) {
			throw new ImportError([
				{
					line: 1,
					column: 1,
					message: `expected columns separated by commas, semicolons or tabs, found one column “${headerLine.slice(0, 60)}” that seems to use ${SEPARATOR_NAME[other] ?? `“${other}”`}. Save the file as CSV (comma-separated) and upload it again`
				}
			]);
		}
	}
	const records: string[][] = [];
	try {
		const parser = parse(head.slice(0, head.lastIndexOf('\n') + 1 || head.length), {
			delimiter: separator,
			relax_column_count: true,
			skip_empty_lines: true,
			to: PREVIEW_ROWS + 1
		});
		for await (const record of parser) records.push(record as string[]);
	} catch (err) {
		throw csvProblem(err);
	}
	const header = (records[0] ?? []).map((h) => h.trim());
	return { separator, header, sample: records.slice(1, 9), encoding };
}

function csvProblem(err: unknown): ImportError {
	const e = err as { code?: string; lines?: number; message?: string };
	const messages: Record<string, string> = {
		CSV_QUOTE_NOT_CLOSED: 'a quoted cell is never closed: expected a closing double quote (")',
		CSV_INVALID_CLOSING_QUOTE: 'expected a separator or the end of the line after a closing quote',
		CSV_NON_TRIMABLE_CHAR_AFTER_CLOSING_QUOTE:
			'expected a separator or the end of the line after a closing quote',
		INVALID_OPENING_QUOTE:
			'a double quote (") appears inside a cell that does not start with one; put the whole cell in quotes and double the inner quote'
	};
	return new ImportError([
		{
			line: e.lines ?? 1,
			column: 1,
			message:
				messages[e.code ?? ''] ?? `the file cannot be read as CSV (${e.message ?? 'unknown error'})`
		}
	]);
}

const squashHeader = (h: string) =>
	h
		.toLowerCase()
		.replace(/\(.*?\)|\[.*?\]/g, '')
		.replace(/[^a-z0-9δ]/g, '');

/** A guess at the mapping from header names; a remembered mapping wins where it fits. */
function suggestSettings(
	kind: ImportKind,
	header: string[],
	remembered: Record<string, string> | null,
	sample: string[][] = []
): ImportSettingsInput {
	const columns: Record<string, string> = {};
	const taken = new Set<string>();
	for (const field of IMPORT_FIELDS[kind]) {
		const rememberedColumn = remembered?.[`col.${field.key}`];
		if (rememberedColumn && header.includes(rememberedColumn)) {
			columns[field.key] = rememberedColumn;
			taken.add(rememberedColumn);
		}
	}
	for (const field of IMPORT_FIELDS[kind]) {
		if (columns[field.key] !== undefined) continue;
		const match =
			header.find((h) => !taken.has(h) && field.hints.includes(squashHeader(h))) ??
			header.find(
				(h) =>
					!taken.has(h) &&
					field.hints.some((hint) => hint.length > 3 && squashHeader(h).startsWith(hint))
			);
		columns[field.key] = match ?? '';
		if (match) taken.add(match);
	}
	let unit = (remembered?.unit as ImportSettingsInput['unit']) ?? 'mbar';
	const dpHeader = (columns.deltaP ?? '').toLowerCase();
	if (dpHeader.includes('kpa')) unit = 'kPa';
	else if (dpHeader.includes('psi')) unit = 'psi';
	else if (dpHeader.includes('mbar')) unit = 'mbar';
	else if (/volt|\(v\)|\bv\b/.test(dpHeader)) unit = 'volts';
	const parsed = importSettingsSchema.safeParse({
		kind,
		columns,
		unit: IMPORT_UNITS.includes(unit) ? unit : 'mbar',
		sensorTypeId: remembered?.sensorTypeId,
		dateFormat: guessDateFormat(kind, header, columns, sample) ?? remembered?.dateFormat,
		condition: remembered?.condition
	});
	return parsed.success
		? parsed.data
		: { kind, columns, unit: 'mbar', dateFormat: 'iso', condition: 'idle' };
}

/** Day-first or month-first when the sample's dates say so (a part above 12 decides). */
function guessDateFormat(
	kind: ImportKind,
	header: string[],
	columns: Record<string, string>,
	sample: string[][]
): 'iso' | 'dmy' | 'mdy' | undefined {
	const key = kind === 'readings' ? 'takenAt' : kind === 'trips' ? 'startedAt' : null;
	const index = key ? header.indexOf(columns[key] ?? '') : -1;
	if (index < 0) return undefined;
	let format: 'dmy' | undefined;
	for (const row of sample) {
		const text = (row[index] ?? '').trim();
		if (/^\d{4}-\d{1,2}-\d{1,2}/.test(text)) return 'iso';
		const m = /^(\d{1,2})[./-](\d{1,2})[./-]\d{4}/.exec(text);
		if (!m) continue;
		if (Number(m[1]) > 12) return 'dmy';
		if (Number(m[2]) > 12) return 'mdy';
		format = 'dmy';
	}
	return format;
}

export interface ImportDescription {
	upload: { id: number; name: string; sizeBytes: number };
	kind: ImportKind;
	separator: string;
	header: string[];
	sample: string[][];
	suggested: ImportSettingsInput;
	sensorTypes: { id: number; name: string }[];
	fleets: { id: number; name: string }[];
	/** Problems that stop the file before any row is read (e.g. a wrong separator). */
	problems: FileProblem[];
}

/** What the mapping step needs to show. */
export async function describeImport(
	user: SessionUser,
	uploadId: number,
	kind: ImportKind
): Promise<ImportDescription> {
	assertImporter(user);
	const upload = await findImportUpload(user, uploadId);
	const [remembered, sensorTypes, fleets] = await Promise.all([
		ColumnMapping.findOne({ where: { organisationId: user.organisationId, kind } }),
		SensorType.findAll({ attributes: ['id', 'name'], order: [['name', 'ASC']] }),
		importFleets(user)
	]);
	let layout: Layout = { separator: ',', header: [], sample: [], encoding: 'utf8' };
	let problems: FileProblem[] = [];
	try {
		layout = await readLayout(upload);
	} catch (err) {
		if (!(err instanceof ImportError)) throw err;
		problems = err.problems;
	}
	return {
		upload: { id: upload.id, name: upload.name, sizeBytes: Number(upload.sizeBytes) },
		kind,
		separator: layout.separator,
		header: layout.header,
		sample: layout.sample,
		suggested: suggestSettings(kind, layout.header, remembered?.mapping ?? null, layout.sample),
		sensorTypes: sensorTypes.map((s) => ({ id: s.id, name: s.name })),
		fleets,
		problems
	};
}

/** The fleets this person imports vans into: their own, or a workshop's contracted fleets. */
async function importFleets(user: SessionUser): Promise<{ id: number; name: string }[]> {
	const ids =
		user.role === 'workshop'
			? await contractedFleetIds(user.organisationId)
			: [user.organisationId];
	const rows = await Organisation.findAll({
		attributes: ['id', 'name'],
		where: { id: { [Op.in]: ids } },
		order: [['name', 'ASC']]
	});
	return rows.map((o) => ({ id: o.id, name: o.name }));
}

/** Builds the row-checking context; header problems (a mapped column missing) come back too. */
async function buildContext(
	user: SessionUser,
	settings: ImportSettingsInput,
	layout: Layout,
	now: Date
): Promise<{ ctx: RowContext; problems: FileProblem[]; fleetId: number | null }> {
	const problems: FileProblem[] = [];
	const columnOf = new Map<string, number>();
	const suggested = suggestSettings(settings.kind, layout.header, null);
	const columns = settings.columns ?? suggested.columns ?? {};
	for (const field of IMPORT_FIELDS[settings.kind]) {
		const name = columns[field.key] ?? '';
		if (name === '') {
			if (field.required) {
				problems.push({
					line: 1,
					column: 1,
					message: `no column is chosen for ${field.label} (required); the header has ${layout.header.map((h) => `“${h}”`).join(', ') || 'no columns'}. Choose the column that holds ${field.label.toLowerCase()}, or add one to the file`
				});
			}
			continue;
		}
		const index = layout.header.findIndex((h) => h === name);
		if (index < 0) {
			problems.push({
				line: 1,
				column: 1,
				message: `the column “${name}” chosen for ${field.label} is not in this file's header (found ${layout.header.map((h) => `“${h}”`).join(', ')})`
			});
			continue;
		}
		columnOf.set(field.key, index);
	}
	let sensor = null;
	if (settings.kind === 'readings' && settings.unit === 'volts') {
		const row = await SensorType.findByPk(settings.sensorTypeId ?? 0);
		if (!row)
			throw new ValidationError('Choose the sensor type that turns volts into Δp.', {
				sensorTypeId: 'Choose a sensor type from the list'
			});
		sensor = {
			zeroVolts: row.zeroVolts,
			fullScaleVolts: row.fullScaleVolts,
			fullScaleMbar: row.fullScaleMbar
		};
	}
	const vans = new Map<string, number[]>();
	const depots = new Map<string, number>();
	let fleetId: number | null = null;
	if (settings.kind === 'vehicles') {
		const fleets = await importFleets(user);
		fleetId =
			user.role === 'fleet_manager'
				? user.organisationId
				: (settings.fleetId ?? (fleets.length === 1 ? fleets[0].id : null));
		if (fleetId === null || !fleets.some((f) => f.id === fleetId)) {
			throw new ValidationError('Choose the fleet the vans belong to.', {
				fleetId: 'Choose one of the fleets you work for'
			});
		}
		for (const d of await Depot.findAll({ where: { organisationId: fleetId } }))
			depots.set(d.name.toLowerCase(), d.id);
	} else {
		const rows = await Vehicle.findAll({
			attributes: ['id', 'registration'],
			where: { [Op.and]: [await vehicleScope(user, now), { archivedAt: null }] }
		});
		for (const v of rows) {
			const key = normalRegistration(v.registration);
			vans.set(key, [...(vans.get(key) ?? []), v.id]);
		}
	}
	const timeZone = user.timeZone || 'Europe/London';
	return {
		ctx: {
			kind: settings.kind,
			settings,
			header: layout.header,
			columnOf,
			decimalComma: layout.separator !== ',',
			timeZone,
			now,
			vans,
			sensor,
			depots
		},
		problems,
		fleetId
	};
}

export interface PreviewRow {
	line: number;
	cells: string[];
	shown: Record<string, string>;
	problems: string[];
}

/** Checks the first rows with these settings, without storing anything. */
export async function previewImport(
	user: SessionUser,
	uploadId: number,
	settings: ImportSettingsInput,
	now = new Date()
): Promise<{ rows: PreviewRow[]; problems: FileProblem[] }> {
	assertImporter(user);
	const upload = await findImportUpload(user, uploadId);
	const layout = await readLayout(upload);
	const { ctx, problems } = await buildContext(user, settings, layout, now);
	if (problems.length) return { rows: [], problems };
	const rows: PreviewRow[] = [];
	for await (const { record, line } of readRecords(upload, layout, PREVIEW_ROWS)) {
		const checked = checkRecord(ctx, record, line);
		rows.push({
			line,
			cells: record,
			shown: checked.shown,
			problems: [...shapeProblems(ctx, record, line), ...checked.problems].map(describeProblem)
		});
	}
	return { rows, problems: [] };
}

/** Column-count problems, with a hint when the line seems to use another separator. */
function shapeProblems(ctx: RowContext, record: string[], line: number): FileProblem[] {
	const width = ctx.header.length;
	if (
		record.length === width ||
		(record.length > width && record.slice(width).every((c) => c.trim() === ''))
	)
		return [];
	const joined = record.join('');
	const other = [';', '\t', ',', '|'].find(
		(s) => s !== (ctx.decimalComma ? ';' : ',') && joined.includes(s)
	);
	const hint = other
		? `; this line seems to use ${SEPARATOR_NAME[other] ?? other} between columns, not the ${SEPARATOR_NAME[ctx.decimalComma ? ';' : ',']} of the header`
		: '';
	const column = Math.min(record.length, width) + (record.length < width ? 1 : 1);
	return [
		{
			line,
			column,
			message: `expected ${width} columns as in the header, found ${record.length}${hint}`
		}
	];
}

/** Data records with their 1-based line numbers, streamed from storage. */
async function* readRecords(
	upload: Upload,
	layout: Layout,
	limit = Infinity,
	onBytes?: (bytes: number) => void
): AsyncGenerator<{ record: string[]; line: number }> {
	const parser = openRead(upload.storagePath).pipe(
		parse({
			delimiter: layout.separator,
			bom: true,
			encoding: layout.encoding,
			relax_column_count: true,
			skip_empty_lines: true,
			info: true,
			from_line: 1
		})
	);
	let first = true;
	let count = 0;
	try {
		for await (const item of parser as AsyncIterable<{
			record: string[];
			info: { lines: number; bytes: number };
		}>) {
			if (first) {
				first = false;
				continue;
			}
			// A row of empty cells (";;;" from a spreadsheet) is a blank line
			if (item.record.every((c) => c.trim() === '')) continue;
			yield { record: item.record, line: item.info.lines };
			onBytes?.(item.info.bytes);
			count += 1;
			if (count >= limit) break;
		}
	} catch (err) {
		throw csvProblem(err);
	} finally {
		parser.destroy();
	}
}

export interface ImportProgress {
	phase: 'checking' | 'saving';
	rows: number;
	bytes: number;
	totalBytes: number;
}

export interface ImportResult {
	batchId: number | null;
	kind: ImportKind;
	fileName: string;
	stored: number;
	duplicates: { count: number; lines: number[] };
	vans: { id: number; registration: string; rows: number }[];
}

/**
 * Checks every row, then stores them all in one transaction as one batch.
 * @throws ImportError listing up to 50 problems (line, column, what was expected); nothing stored
 */
export async function runImport(
	user: SessionUser,
	uploadId: number,
	settings: ImportSettingsInput,
	now = new Date(),
	onProgress?: (p: ImportProgress) => void
): Promise<ImportResult> {
	assertImporter(user);
	const upload = await findImportUpload(user, uploadId);
	const layout = await readLayout(upload);
	const {
		ctx,
		problems: headerProblems,
		fleetId
	} = await buildContext(user, settings, layout, now);
	if (headerProblems.length) throw new ImportError(headerProblems);
	const totalBytes = Number(upload.sizeBytes);
	const problems: FileProblem[] = [];
	let totalProblems = 0;
	const rows: { line: number; row: ReadingRow | TripRow | VehicleRow }[] = [];
	let count = 0;
	let bytes = 0;
	for await (const { record, line } of readRecords(upload, layout, Infinity, (b) => (bytes = b))) {
		count += 1;
		if (count > config.IMPORT_MAX_ROWS) {
			throw new ImportError([
				{
					line,
					column: 1,
					message: `the file has more than the ${config.IMPORT_MAX_ROWS.toLocaleString('en-GB')} rows one import takes; split it into smaller files`
				}
			]);
		}
		const shape = shapeProblems(ctx, record, line);
		const checked = shape.length ? { problems: shape, row: null } : checkRecord(ctx, record, line);
		if (checked.problems.length) {
			totalProblems += checked.problems.length;
			for (const p of checked.problems) if (problems.length < MAX_PROBLEMS) problems.push(p);
		} else if (checked.row) rows.push({ line, row: checked.row });
		if (onProgress && count % 5000 === 0)
			onProgress({ phase: 'checking', rows: count, bytes, totalBytes });
	}
	if (totalProblems) throw new ImportError(problems, totalProblems);
	if (count === 0) {
		throw new ImportError([
			{ line: 2, column: 1, message: 'the file has a header but no rows to import' }
		]);
	}
	onProgress?.({ phase: 'saving', rows: count, bytes: totalBytes, totalBytes });
	const result = await getDb().transaction(async () => {
		await serializeOn(getDb(), readingsTopic(user.organisationId));
		const batch = await ImportBatch.create({
			organisationId: user.organisationId,
			kind: settings.kind,
			fileName: upload.name,
			rowCount: 0,
			createdById: user.id,
			createdAt: now,
			updatedAt: now
		});
		let stored: { line: number; vehicleId: number | null }[] = [];
		let duplicateLines: number[] = [];
		if (settings.kind === 'readings')
			({ stored, duplicateLines } = await storeReadings(
				user,
				batch.id,
				rows as { line: number; row: ReadingRow }[],
				now
			));
		else if (settings.kind === 'trips')
			({ stored, duplicateLines } = await storeTrips(
				batch.id,
				rows as { line: number; row: TripRow }[],
				now
			));
		else
			({ stored, duplicateLines } = await storeVans(
				fleetId!,
				batch.id,
				rows as { line: number; row: VehicleRow }[],
				now
			));
		await batch.update({ rowCount: stored.length });
		await rememberMapping(user, settings);
		await recordAudit(
			user,
			'import.run',
			'import_batch',
			batch.id,
			{ kind: settings.kind, uploadId, stored: stored.length, duplicates: duplicateLines.length },
			now
		);
		return { batch, stored, duplicateLines };
	});
	const perVan = new Map<number, number>();
	for (const s of result.stored)
		if (s.vehicleId !== null) perVan.set(s.vehicleId, (perVan.get(s.vehicleId) ?? 0) + 1);
	const vans = perVan.size
		? await Vehicle.findAll({
				attributes: ['id', 'registration'],
				where: { id: { [Op.in]: [...perVan.keys()] } },
				order: [['registration', 'ASC']]
			})
		: [];
	return {
		batchId: result.batch.id,
		kind: settings.kind,
		fileName: upload.name,
		stored: result.stored.length,
		duplicates: { count: result.duplicateLines.length, lines: result.duplicateLines.slice(0, 20) },
		vans: vans.map((v) => ({ id: v.id, registration: v.registration, rows: perVan.get(v.id) ?? 0 }))
	};
}

async function storeReadings(
	user: SessionUser,
	batchId: number,
	rows: { line: number; row: ReadingRow }[],
	now: Date
) {
	const spans = new Map<number, { from: Date; to: Date }>();
	for (const { row } of rows) {
		const span = spans.get(row.vehicleId);
		if (!span) spans.set(row.vehicleId, { from: row.takenAt, to: row.takenAt });
		else {
			if (row.takenAt < span.from) span.from = row.takenAt;
			if (row.takenAt > span.to) span.to = row.takenAt;
		}
	}
	const { times } = await existingReadingKeys(spans);
	const fresh: typeof rows = [];
	const duplicateLines: number[] = [];
	for (const item of rows) {
		const key = vanTimeKey(item.row.vehicleId, item.row.takenAt);
		if (times.has(key)) duplicateLines.push(item.line);
		else {
			times.add(key);
			fresh.push(item);
		}
	}
	await insertReadings(
		fresh.map(({ row }) => ({
			...row,
			source: 'import' as const,
			importBatchId: batchId,
			authorId: user.id
		})),
		now
	);
	return {
		stored: fresh.map((f) => ({ line: f.line, vehicleId: f.row.vehicleId })),
		duplicateLines
	};
}

async function storeTrips(batchId: number, rows: { line: number; row: TripRow }[], now: Date) {
	const vans = [...new Set(rows.map((r) => r.row.vehicleId))];
	const existing = new Set<string>();
	for (const vehicleId of vans) {
		const times = rows
			.filter((r) => r.row.vehicleId === vehicleId)
			.map((r) => r.row.startedAt.getTime());
		const found = (await Trip.findAll({
			attributes: ['startedAt'],
			where: {
				vehicleId,
				startedAt: { [Op.between]: [new Date(Math.min(...times)), new Date(Math.max(...times))] }
			},
			raw: true
		})) as unknown as { startedAt: string | Date }[];
		for (const t of found) existing.add(vanTimeKey(vehicleId, t.startedAt));
	}
	const fresh: typeof rows = [];
	const duplicateLines: number[] = [];
	for (const item of rows) {
		const key = vanTimeKey(item.row.vehicleId, item.row.startedAt);
		if (existing.has(key)) duplicateLines.push(item.line);
		else {
			existing.add(key);
			fresh.push(item);
		}
	}
	const qi = getDb().getQueryInterface();
	for (let i = 0; i < fresh.length; i += 1000) {
		await qi.bulkInsert(
			'trips',
			fresh.slice(i, i + 1000).map(({ row }) => ({
				vehicle_id: row.vehicleId,
				driver_id: null,
				started_at: row.startedAt,
				ended_at: row.endedAt,
				distance_km: row.distanceKm,
				idle_minutes: row.idleMinutes,
				mean_speed_kmh: row.meanSpeedKmh,
				import_batch_id: batchId,
				created_at: now,
				updated_at: now
			}))
		);
	}
	return {
		stored: fresh.map((f) => ({ line: f.line, vehicleId: f.row.vehicleId })),
		duplicateLines
	};
}

async function storeVans(
	fleetId: number,
	batchId: number,
	rows: { line: number; row: VehicleRow }[],
	now: Date
) {
	const existing = new Set(
		(
			await Vehicle.findAll({ attributes: ['registration'], where: { organisationId: fleetId } })
		).map((v) => normalRegistration(v.registration))
	);
	const stored: { line: number; vehicleId: number | null }[] = [];
	const duplicateLines: number[] = [];
	for (const { line, row } of rows) {
		if (existing.has(row.registration)) {
			duplicateLines.push(line);
			continue;
		}
		existing.add(row.registration);
		const van = await Vehicle.create({
			...row,
			organisationId: fleetId,
			importBatchId: batchId,
			createdAt: now,
			updatedAt: now
		});
		stored.push({ line, vehicleId: van.id });
	}
	return { stored, duplicateLines };
}

async function rememberMapping(user: SessionUser, settings: ImportSettingsInput): Promise<void> {
	const mapping: Record<string, string> = {
		unit: settings.unit,
		dateFormat: settings.dateFormat,
		condition: settings.condition
	};
	if (settings.sensorTypeId) mapping.sensorTypeId = String(settings.sensorTypeId);
	for (const [field, column] of Object.entries(settings.columns ?? {}))
		if (column) mapping[`col.${field}`] = column;
	const row = await ColumnMapping.findOne({
		where: { organisationId: user.organisationId, kind: settings.kind }
	});
	if (row) await row.update({ mapping });
	else
		await ColumnMapping.create({
			organisationId: user.organisationId,
			kind: settings.kind,
			mapping
		});
}

export interface BatchView {
	id: number;
	kind: string;
	fileName: string | null;
	rowCount: number;
	createdAt: string;
	createdBy: string | null;
	undoneAt: string | null;
}

/** This organisation's imports and API batches, newest first. */
export async function listImportBatches(user: SessionUser, limit = 50): Promise<BatchView[]> {
	assertImporter(user);
	const rows = await ImportBatch.findAll({
		where: { organisationId: user.organisationId },
		order: [['id', 'DESC']],
		limit
	});
	const authorIds = [...new Set(rows.flatMap((r) => (r.createdById ? [r.createdById] : [])))];
	const authors = new Map(
		(await User.findAll({ attributes: ['id', 'name'], where: { id: { [Op.in]: authorIds } } })).map(
			(u) => [u.id, u.name]
		)
	);
	return rows.map((b) => ({
		id: b.id,
		kind: b.kind,
		fileName: b.fileName ?? null,
		rowCount: b.rowCount,
		createdAt: new Date(b.createdAt).toISOString(),
		createdBy: b.createdById ? (authors.get(b.createdById) ?? null) : null,
		undoneAt: b.undoneAt ? new Date(b.undoneAt).toISOString() : null
	}));
}

/** Removes every row a batch stored, in one transaction, and marks it undone. */
export async function undoImportBatch(
	user: SessionUser,
	batchId: number,
	now = new Date()
): Promise<BatchView> {
	assertImporter(user);
	await getDb().transaction(async () => {
		const batch = await ImportBatch.findOne({
			where: { id: batchId, organisationId: user.organisationId }
		});
		if (!batch) throw new NotFoundError('That import');
		if (batch.undoneAt) throw new ValidationError('This import was already undone.');
		let removed = 0;
		if (batch.kind === 'vehicles') {
			const vans = await Vehicle.findAll({
				attributes: ['id', 'registration'],
				where: { importBatchId: batch.id }
			});
			const ids = vans.map((v) => v.id);
			if (ids.length) {
				const withData = await Reading.findOne({
					attributes: ['vehicleId'],
					where: { vehicleId: { [Op.in]: ids } }
				});
				const withTrips = withData
					? null
					: await Trip.findOne({
							attributes: ['vehicleId'],
							where: { vehicleId: { [Op.in]: ids } }
						});
				const busy = withData ?? withTrips;
				if (busy) {
					const reg = vans.find((v) => v.id === busy.vehicleId)?.registration;
					throw new ValidationError(
						`${reg} already has readings or trips; undo the imports that added them first, or archive the van instead.`
					);
				}
				removed = await Vehicle.destroy({ where: { id: { [Op.in]: ids } } });
			}
		} else {
			removed =
				(await Reading.destroy({ where: { importBatchId: batch.id } })) +
				(await Trip.destroy({ where: { importBatchId: batch.id } })) +
				(await VehicleEvent.destroy({ where: { importBatchId: batch.id } }));
		}
		await batch.update({ undoneAt: now });
		await recordAudit(user, 'import.undo', 'import_batch', batch.id, { removed }, now);
	});
	return (await listImportBatches(user, 500)).find((b) => b.id === batchId)!;
}

export { describeProblem };

/** One batch of this organisation with the vans it touched (for the page after an import). */
export async function describeBatch(user: SessionUser, batchId: number) {
	assertImporter(user);
	const batch = (await listImportBatches(user, 500)).find((b) => b.id === batchId);
	if (!batch) throw new NotFoundError('That import');
	const table = batch.kind === 'trips' ? Trip : batch.kind === 'events' ? VehicleEvent : Reading;
	let vans: { id: number; registration: string; rows: number }[] = [];
	if (batch.kind === 'vehicles') {
		const rows = await Vehicle.findAll({
			attributes: ['id', 'registration'],
			where: { importBatchId: batchId },
			order: [['registration', 'ASC']]
		});
		vans = rows.map((v) => ({ id: v.id, registration: v.registration, rows: 1 }));
	} else {
		const counts = (await (table as typeof Reading).findAll({
			attributes: ['vehicleId', [getDb().fn('COUNT', getDb().col('id')), 'rows']],
			where: { importBatchId: batchId },
			group: ['vehicleId'],
			raw: true
		})) as unknown as { vehicleId: number; rows: number }[];
		const regs = new Map(
			(
				await Vehicle.findAll({
					attributes: ['id', 'registration'],
					where: { id: { [Op.in]: counts.map((c) => c.vehicleId) } }
				})
			).map((v) => [v.id, v.registration])
		);
		vans = counts
			.map((c) => ({
				id: c.vehicleId,
				registration: regs.get(c.vehicleId) ?? '?',
				rows: Number(c.rows)
			}))
			.sort((a, b) => a.registration.localeCompare(b.registration));
	}
	return { batch, vans };
}
