import { beforeAll, describe, expect, inject, it } from 'vitest';
import { Client } from './http';
import { DEMO_ACCOUNTS } from '../../src/lib/server/demo/scenario';

const baseUrl = inject('baseUrl');
const fleet = new Client(baseUrl);
const workshop = new Client(baseUrl);
const pastWorkshop = new Client(baseUrl);
let db: typeof import('../../src/lib/server/db');
const van = { id: 0, registration: 'LKD 412' };

/** An ISO time `hours` before now, on a whole second with an odd offset so it meets no demo reading. */
const hoursAgo = (hours: number) =>
	new Date(Math.floor(Date.now() / 1000) * 1000 - hours * 3_600_000 - 17_000).toISOString();

async function stage(
	client: Client,
	body: string | Uint8Array,
	kind = 'readings',
	fileName = 'readings.csv'
) {
	return client.request(`/api/v1/imports?kind=${kind}&fileName=${encodeURIComponent(fileName)}`, {
		method: 'POST',
		headers: { 'content-type': 'text/csv' },
		body: body as BodyInit
	});
}

async function run(client: Client, uploadId: number, settings: Record<string, unknown>) {
	return client.request(`/api/v1/imports/${uploadId}`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify({ kind: 'readings', ...settings })
	});
}

/** Stages and imports a CSV; returns the run's status and body. */
async function importCsv(
	client: Client,
	csv: string,
	settings: Record<string, unknown> = {},
	kind = 'readings'
) {
	const staged = await stage(client, csv, kind);
	expect(staged.status, await staged.clone().text()).toBe(201);
	const { upload } = (await staged.json()) as { upload: { id: number } };
	const res = await run(client, upload.id, { kind, ...settings });
	return {
		status: res.status,
		body: (await res.json()) as Record<string, any>,
		uploadId: upload.id
	};
}

const importedCount = async (vehicleId = van.id) =>
	db.Reading.count({ where: { vehicleId, source: 'import' } });

beforeAll(async () => {
	process.env.DATABASE_URL = inject('databaseUrl');
	db = await import('../../src/lib/server/db');
	db.getDb();
	van.id = (await db.Vehicle.findOne({ where: { registration: van.registration } }))!.id;
	expect((await fleet.signIn(DEMO_ACCOUNTS.fleetManager.email)).status).toBe(303);
	expect((await workshop.signIn(DEMO_ACCOUNTS.workshop.email)).status).toBe(303);
	expect((await pastWorkshop.signIn(DEMO_ACCOUNTS.otherWorkshop.email)).status).toBe(303);
});

describe('CSV import of readings', () => {
	it('refuses a file with a bad line, naming line and column, and stores nothing', async () => {
		const before = await importedCount();
		const csv = [
			'registration,taken_at,dp_mbar',
			`${van.registration},${hoursAgo(5)},140`,
			`${van.registration},${hoursAgo(4)},14x0`,
			`${van.registration},${hoursAgo(3)},150`
		].join('\n');
		const { status, body } = await importCsv(fleet, csv);
		expect(status).toBe(400);
		expect(body.error.code).toBe('import_invalid');
		expect(body.error.problems).toHaveLength(1);
		expect(body.error.problems[0]).toMatchObject({ line: 3, column: 3, columnName: 'dp_mbar' });
		expect(body.error.message).toBe(
			'Line 3, column 3 (dp_mbar): expected a number such as 123.4 for Δp, found “14x0”'
		);
		expect(await importedCount()).toBe(before);
	});

	it('imports a good file in one batch, reports duplicates instead of doubling them, and undoes the batch', async () => {
		const before = await importedCount();
		const times = [hoursAgo(30), hoursAgo(29), hoursAgo(28)];
		const csv = [
			'registration,taken_at,dp_mbar,odometer_km',
			...times.map((t, i) => `${van.registration},${t},${200 + i},${101000 + i}`)
		].join('\n');
		const first = await importCsv(fleet, csv);
		expect(first.status).toBe(201);
		expect(first.body).toMatchObject({
			stored: 3,
			duplicates: { count: 0 },
			vans: [{ id: van.id, rows: 3 }]
		});
		expect(await importedCount()).toBe(before + 3);
		const row = await db.Reading.findOne({
			where: { vehicleId: van.id, takenAt: new Date(times[1]) }
		});
		expect(row).toMatchObject({
			deltaPMbar: 201,
			odometerKm: 101001,
			source: 'import',
			condition: 'idle',
			importBatchId: first.body.batchId
		});

		const again = await importCsv(fleet, csv);
		expect(again.status).toBe(201);
		expect(again.body).toMatchObject({ stored: 0, duplicates: { count: 3, lines: [2, 3, 4] } });
		expect(await importedCount()).toBe(before + 3);

		const undo = await fleet.request(`/api/v1/import-batches/${first.body.batchId}`, {
			method: 'DELETE'
		});
		expect(undo.status).toBe(200);
		expect(((await undo.json()) as { undoneAt: string | null }).undoneAt).not.toBeNull();
		expect(await importedCount()).toBe(before);
		const twice = await fleet.request(`/api/v1/import-batches/${first.body.batchId}`, {
			method: 'DELETE'
		});
		expect(twice.status).toBe(400);
	});

	it('says so when the file uses another separator', async () => {
		const csv = ['registration|taken_at|dp_mbar', `${van.registration}|${hoursAgo(2)}|120`].join(
			'\n'
		);
		const staged = await stage(fleet, csv);
		expect(staged.status).toBe(201);
		const description = (await staged.json()) as {
			upload: { id: number };
			problems: { message: string }[];
		};
		expect(description.problems[0].message).toMatch(
			/expected columns separated by commas, semicolons or tabs.*vertical bars/
		);
		const res = await run(fleet, description.upload.id, {});
		expect(res.status).toBe(400);
		expect(((await res.json()) as any).error.message).toMatch(
			/^Line 1, column 1: expected columns separated by commas/
		);
	});

	it('points at a line whose separator differs from the header', async () => {
		const csv = ['registration,taken_at,dp_mbar', `${van.registration};${hoursAgo(2)};120`].join(
			'\n'
		);
		const { status, body } = await importCsv(fleet, csv);
		expect(status).toBe(400);
		expect(body.error.message).toMatch(
			/^Line 2, column 2: expected 3 columns as in the header, found 1; this line seems to use semicolons between columns/
		);
	});

	it('names a missing required column', async () => {
		const csv = [
			'registration,taken_at,odometer_km',
			`${van.registration},${hoursAgo(2)},1000`
		].join('\n');
		const { status, body } = await importCsv(fleet, csv);
		expect(status).toBe(400);
		expect(body.error.message).toMatch(
			/no column is chosen for Δp \(required\); the header has “registration”, “taken_at”, “odometer_km”/
		);
	});

	it('names a chosen column that is not in the file', async () => {
		const csv = ['registration,taken_at,dp_mbar', `${van.registration},${hoursAgo(2)},120`].join(
			'\n'
		);
		const { status, body } = await importCsv(fleet, csv, {
			columns: { registration: 'registration', takenAt: 'taken_at', deltaP: 'pressure' }
		});
		expect(status).toBe(400);
		expect(body.error.message).toMatch(
			/the column “pressure” chosen for Δp is not in this file's header/
		);
	});

	it('refuses an empty file', async () => {
		const res = await stage(fleet, '', 'readings', 'empty.csv');
		expect(res.status).toBe(400);
		expect(((await res.json()) as any).error.message).toBe(
			'“empty.csv” is empty: there is nothing to read.'
		);
	});

	it('refuses a file with a header and no rows', async () => {
		const { status, body } = await importCsv(fleet, 'registration,taken_at,dp_mbar\n');
		expect(status).toBe(400);
		expect(body.error.message).toBe(
			'Line 2, column 1: the file has a header but no rows to import'
		);
	});

	it('refuses a workbook renamed to .csv, by its content', async () => {
		// "PK\x03\x04": the ZIP local file header that opens every .xlsx (PKWARE APPNOTE 4.3.7)
		const bytes = new Uint8Array([
			0x50, 0x4b, 0x03, 0x04, 0x14, 0, 6, 0, 8, 0, 0, 0, 0x21, 0, 0x62, 0x9e
		]);
		const res = await stage(fleet, bytes, 'readings', 'fleet.csv');
		expect(res.status).toBe(400);
		expect(((await res.json()) as any).error.message).toMatch(
			/“fleet\.csv” is not a text \(CSV\) file: it looks like a ZIP archive or an Excel\/OpenDocument workbook/
		);
	});

	it('refuses a file over the size limit with 413', async () => {
		const big = new Uint8Array(20 * 1024 * 1024 + 10).fill(0x61);
		const res = await stage(fleet, big, 'readings', 'huge.csv');
		expect(res.status).toBe(413);
		expect(((await res.json()) as any).error.message).toMatch(
			/“huge\.csv” is larger than the 20 MB an import takes/
		);
	});

	it('refuses dates in the future', async () => {
		const future = new Date(Date.now() + 3 * 86_400_000).toISOString();
		const csv = ['registration,taken_at,dp_mbar', `${van.registration},${future},120`].join('\n');
		const { status, body } = await importCsv(fleet, csv);
		expect(status).toBe(400);
		expect(body.error.problems[0]).toMatchObject({ line: 2, column: 2 });
		expect(body.error.message).toMatch(
			/is in the future; only what has already happened can be imported/
		);
	});

	it('refuses negative odometers', async () => {
		const csv = [
			'registration,taken_at,dp_mbar,odometer_km',
			`${van.registration},${hoursAgo(2)},120,-5`
		].join('\n');
		const { status, body } = await importCsv(fleet, csv);
		expect(status).toBe(400);
		expect(body.error.message).toBe(
			'Line 2, column 4 (odometer_km): expected odometer (km) of 0 km or more, found -5 (it cannot be negative)'
		);
	});

	it("refuses readings for another fleet's van without saying it exists", async () => {
		const csv = ['registration,taken_at,dp_mbar', `TDU 71,${hoursAgo(2)},120`].join('\n');
		const { status, body } = await importCsv(fleet, csv);
		expect(status).toBe(400);
		expect(body.error.message).toBe(
			'Line 2, column 1 (registration): no van “TDU 71” among the vans you can import for; check the registration, or add the van first'
		);
	});

	it('lists every problem of a file, each with its line', async () => {
		const csv = [
			'registration,taken_at,dp_mbar',
			`${van.registration},yesterday,120`,
			`${van.registration},${hoursAgo(2)},`,
			`NOPE 1,${hoursAgo(2)},120`
		].join('\n');
		const { body } = await importCsv(fleet, csv);
		expect(
			body.error.problems.map((p: { line: number; column: number }) => [p.line, p.column])
		).toEqual([
			[2, 2],
			[3, 3],
			[4, 1]
		]);
	});

	it('reads semicolon files with decimal commas in kPa, remembers the mapping, and reads volts through a sensor type', async () => {
		const t1 = hoursAgo(40);
		const kpa = await importCsv(
			fleet,
			['Kennzeichen;Zeit;dp (kPa)', `${van.registration};${t1};12,5`].join('\n'),
			{
				columns: { registration: 'Kennzeichen', takenAt: 'Zeit', deltaP: 'dp (kPa)' },
				unit: 'kPa'
			}
		);
		expect(kpa.status).toBe(201);
		// 12.5 kPa = 125 mbar (SI prefixes: 1 kPa = 1000 Pa, 1 mbar = 100 Pa)
		expect(
			(await db.Reading.findOne({ where: { vehicleId: van.id, takenAt: new Date(t1) } }))!
				.deltaPMbar
		).toBeCloseTo(125, 9);

		// The next file with the same header is offered the same mapping and unit
		const staged = await stage(
			fleet,
			['Kennzeichen;Zeit;dp (kPa)', `${van.registration};${hoursAgo(2)};12,5`].join('\n')
		);
		const description = (await staged.json()) as {
			suggested: { columns: Record<string, string>; unit: string };
		};
		expect(description.suggested.columns).toMatchObject({
			registration: 'Kennzeichen',
			takenAt: 'Zeit',
			deltaP: 'dp (kPa)'
		});
		expect(description.suggested.unit).toBe('kPa');

		const t2 = hoursAgo(41);
		const sensor = await db.SensorType.findOne({ where: { fullScaleMbar: 1000 } });
		const volts = await importCsv(
			fleet,
			['registration,taken_at,signal_v', `${van.registration},${t2},1.5`].join('\n'),
			{
				columns: { registration: 'registration', takenAt: 'taken_at', deltaP: 'signal_v' },
				unit: 'volts',
				sensorTypeId: sensor!.id
			}
		);
		expect(volts.status).toBe(201);
		// 0.5–4.5 V for 0–1000 mbar: (1.5 − 0.5) × 250 mbar/V = 250 mbar (DOMAIN.md transfer function; common trade practice)
		const row = await db.Reading.findOne({ where: { vehicleId: van.id, takenAt: new Date(t2) } });
		expect(row!.deltaPMbar).toBeCloseTo(250, 9);
		expect(row!.rawVolts).toBe(1.5);
	});

	it("reads day-first dates without a zone in the importer's zone", async () => {
		const csv = ['registration,date,dp_mbar', `${van.registration},14/01/2025 09:00,130`].join(
			'\n'
		);
		const { status, body } = await importCsv(fleet, csv, { dateFormat: 'dmy' });
		expect(status).toBe(201);
		// Maren's zone is Europe/London; 14 January is on GMT (UTC+0), SI 2002/262
		const row = await db.Reading.findOne({ where: { importBatchId: body.batchId } });
		expect(new Date(row!.takenAt).toISOString()).toBe('2025-01-14T09:00:00.000Z');
	});
});

describe('imports by workshops', () => {
	it('lets a contracted workshop import readings for the fleet it serves', async () => {
		const csv = ['van,time,pressure', `${van.registration},${hoursAgo(50)},160`].join('\n');
		const { status, body } = await importCsv(workshop, csv);
		expect(status).toBe(201);
		expect(body.stored).toBe(1);
	});

	it('refuses a workshop whose contract has ended, as if the van did not exist', async () => {
		const csv = ['van,time,pressure', `${van.registration},${hoursAgo(51)},160`].join('\n');
		const { status, body } = await importCsv(pastWorkshop, csv);
		expect(status).toBe(400);
		expect(body.error.message).toMatch(/no van “LKD 412” among the vans you can import for/);
	});
});

describe('trips and vans', () => {
	it('imports trips and refuses an end before the start', async () => {
		const start = hoursAgo(70);
		const end = new Date(new Date(start).getTime() + 25 * 60_000).toISOString();
		const ok = await importCsv(
			fleet,
			[
				'registration,start,end,distance_km,idle_minutes',
				`${van.registration},${start},${end},31.5,3`
			].join('\n'),
			{},
			'trips'
		);
		expect(ok.status).toBe(201);
		expect(await db.Trip.count({ where: { importBatchId: ok.body.batchId } })).toBe(1);
		const bad = await importCsv(
			fleet,
			['registration,start,end,distance_km', `${van.registration},${end},${start},31.5`].join('\n'),
			{},
			'trips'
		);
		expect(bad.status).toBe(400);
		expect(bad.body.error.message).toMatch(
			/^Line 2, column 3 \(end\): expected the end to come after the start/
		);
	});

	it('imports new vans, reports ones already in the fleet, and undoes them', async () => {
		const csv = [
			'registration,make_model,depot,fuel',
			'LKD 901,Mid panel van 2.0,Eastgate depot,HVO',
			'LKD 401,Compact panel van 1.5,,diesel'
		].join('\n');
		const { status, body } = await importCsv(fleet, csv, {}, 'vehicles');
		expect(status).toBe(201);
		expect(body).toMatchObject({ stored: 1, duplicates: { count: 1, lines: [3] } });
		const created = await db.Vehicle.findOne({ where: { registration: 'LKD 901' } });
		expect(created).toMatchObject({ fuel: 'paraffinic_en15940', importBatchId: body.batchId });
		const undo = await fleet.request(`/api/v1/import-batches/${body.batchId}`, {
			method: 'DELETE'
		});
		expect(undo.status).toBe(200);
		expect(await db.Vehicle.findOne({ where: { registration: 'LKD 901' } })).toBeNull();
	});

	it('names an unknown depot', async () => {
		const { status, body } = await importCsv(
			fleet,
			['registration,depot', 'LKD 902,Harbour depot'].join('\n'),
			{},
			'vehicles'
		);
		expect(status).toBe(400);
		expect(body.error.message).toMatch(
			/expected the name of one of the fleet's depots .*found “Harbour depot”/
		);
	});
});

describe('import pages', () => {
	it('takes an upload through the form and opens the mapping step', async () => {
		const form = new FormData();
		form.set('kind', 'readings');
		form.set(
			'file',
			new Blob([`registration,taken_at,dp_mbar\n${van.registration},${hoursAgo(2)},120\n`], {
				type: 'text/csv'
			}),
			'from-form.csv'
		);
		const res = await fleet.request('/fleet/imports?/upload', {
			method: 'POST',
			body: form,
			headers: { accept: 'text/html' }
		});
		expect(res.status).toBe(303);
		const location = res.headers.get('location')!;
		expect(location).toMatch(/^\/fleet\/imports\/\d+\?kind=readings$/);
		const page = await fleet.request(location, { headers: { accept: 'text/html' } });
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('Map the columns');
		expect(html).toContain('from-form.csv');
	});

	it("keeps one organisation's uploads from another", async () => {
		const staged = await stage(
			fleet,
			`registration,taken_at,dp_mbar\n${van.registration},${hoursAgo(2)},120\n`
		);
		const { upload } = (await staged.json()) as { upload: { id: number } };
		const other = new Client(baseUrl);
		await other.signIn(DEMO_ACCOUNTS.otherFleetManager.email);
		expect(
			(
				await other.request(`/fleet/imports/${upload.id}?kind=readings`, {
					headers: { accept: 'text/html' }
				})
			).status
		).toBe(404);
		expect((await run(other, upload.id, {})).status).toBe(404);
		// The page's own form actions answer the same 404, and nothing is imported.
		const before = await importedCount();
		for (const action of ['preview', 'import']) {
			const res = await other.request(`/fleet/imports/${upload.id}?/${action}`, {
				method: 'POST',
				headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
				body: new URLSearchParams({ kind: 'readings' })
			});
			expect(res.status, action).toBe(404);
		}
		expect(await importedCount()).toBe(before);
	});
});
