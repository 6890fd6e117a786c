import { createHash } from 'node:crypto';
import { beforeAll, describe, expect, inject, it } from 'vitest';
import { Client } from './http';
import { DEMO_ACCOUNTS } from '../../src/lib/server/demo/scenario';
import { generateStaticTestCapture, HEALTHY_SPEC } from '../../src/lib/domain/capture/synthetic';
import { mbarToVolts, DEFAULT_SENSOR } from '../../src/lib/domain/sensor';

const baseUrl = inject('baseUrl');
const workshop = new Client(baseUrl);
const fleet = new Client(baseUrl);
const otherFleet = new Client(baseUrl);
const otherWorkshop = new Client(baseUrl);
let db: typeof import('../../src/lib/server/db');
let vanId = 0;

/** The healthy synthetic capture (idle 18 mbar, throttle 80 mbar above a 0.5 V engine-off level) as CSV. */
function healthyCsv(): string {
	const { timesS, volts } = generateStaticTestCapture();
	const lines = ['Time (ms),Channel A (V)'];
	for (let i = 0; i < timesS.length; i++)
		lines.push(`${(timesS[i] * 1000).toFixed(3)},${volts[i].toFixed(5)}`);
	return lines.join('\n') + '\n';
}

function upload(
	client: Client,
	vehicleId: number,
	body: string | Uint8Array,
	fileName = 'capture.csv'
) {
	return client.request(`/api/v1/vehicles/${vehicleId}/captures?fileName=${fileName}`, {
		method: 'POST',
		headers: { 'content-type': 'text/csv' },
		body: body as BodyInit
	});
}

let csv = '';
let testId = 0;

beforeAll(async () => {
	process.env.DATABASE_URL = inject('databaseUrl');
	db = await import('../../src/lib/server/db');
	db.getDb();
	vanId = (await db.Vehicle.findOne({ where: { registration: 'LKD 420' } }))!.id;
	expect((await workshop.signIn(DEMO_ACCOUNTS.workshop.email)).status).toBe(303);
	expect((await fleet.signIn(DEMO_ACCOUNTS.fleetManager.email)).status).toBe(303);
	expect((await otherFleet.signIn(DEMO_ACCOUNTS.otherFleetManager.email)).status).toBe(303);
	expect((await otherWorkshop.signIn(DEMO_ACCOUNTS.otherWorkshop.email)).status).toBe(303);
	csv = healthyCsv();
	const res = await upload(workshop, vanId, csv);
	expect(res.status, await res.clone().text()).toBe(201);
	testId = ((await res.json()) as { testId: number }).testId;
});

describe('capture uploads', () => {
	it('stores the file with its SHA-256 and size, judges it and saves the result on the van', async () => {
		const test = await db.SensorTest.findByPk(testId);
		expect(test).toMatchObject({ vehicleId: vanId, kind: 'static' });
		const upload = await db.Upload.findByPk(test!.uploadId!);
		expect(upload!.sha256).toBe(createHash('sha256').update(csv).digest('hex'));
		expect(Number(upload!.sizeBytes)).toBe(Buffer.byteLength(csv));
		const result = test!.result as any;
		expect(result.capture.sampleCount).toBe(40_000); // 20 s at 2 kHz (HEALTHY_SPEC)
		expect(Object.keys(result.report.boundaries).sort()).toEqual([
			'idle',
			'ignitionOn',
			'start',
			'throttle'
		]);
		expect(result.report.overall.level).toMatch(/good|acceptable/);
		expect(test!.verdict).toBe(result.report.overall.level);
	});

	it("adds the idle mean Δp to the van's readings", async () => {
		const rows = await db.Reading.findAll({ where: { vehicleId: vanId, source: 'capture' } });
		expect(rows).toHaveLength(1);
		expect(rows[0].condition).toBe('idle');
		// check value: the generator's idle level, 18 mbar above engine off (synthetic.ts HEALTHY_SPEC, invented data)
		expect(rows[0].deltaPMbar).toBeGreaterThan(HEALTHY_SPEC.idleMbar - 3);
		expect(rows[0].deltaPMbar).toBeLessThan(HEALTHY_SPEC.idleMbar + 3);
	});

	it('serves decimated chart data for any visible range, down to the pulsation', async () => {
		const whole = await workshop.request(`/api/v1/sensor-tests/${testId}/trace?points=400`);
		expect(whole.status).toBe(200);
		const overview = (await whole.json()) as {
			buckets: { startS: number; minVolts: number; maxVolts: number }[];
			bucketWidthS: number;
		};
		expect(overview.buckets.length).toBeGreaterThan(100);
		expect(overview.buckets.length).toBeLessThanOrEqual(401);
		// Throttle top: 80 mbar above 0.5 V → 0.82 V (HEALTHY_SPEC through the 250 mbar/V default sensor)
		const peak = Math.max(...overview.buckets.map((b) => b.maxVolts));
		expect(peak).toBeGreaterThan(mbarToVolts(80, DEFAULT_SENSOR));
		const zoomed = (await (
			await workshop.request(`/api/v1/sensor-tests/${testId}/trace?from=8&to=8.1&points=400`)
		).json()) as typeof overview;
		expect(
			zoomed.buckets.every((b) => b.startS >= 8 - overview.bucketWidthS && b.startS <= 8.1)
		).toBe(true);
		// A 0.1 s window at idle spans about 2.7 pulses at 27 Hz: the trace must show their swing
		const swing =
			Math.max(...zoomed.buckets.map((b) => b.maxVolts)) -
			Math.min(...zoomed.buckets.map((b) => b.minVolts));
		expect(swing).toBeGreaterThan(0.02);
		expect((await otherWorkshop.request(`/api/v1/sensor-tests/${testId}/trace`)).status).toBe(404);
	});

	it('lets the workshop adjust the phases and judges again, replacing the derived reading', async () => {
		const form = new URLSearchParams({
			'ignitionOn.startS': '0',
			'ignitionOn.endS': '2.5',
			'idle.startS': '7',
			'idle.endS': '13'
		});
		const res = await workshop.request(`/workshop/vans/${vanId}/tests/${testId}?/phases`, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
			body: form
		});
		expect(res.status).toBe(303);
		const test = await db.SensorTest.findByPk(testId);
		const result = test!.result as any;
		expect(result.report.phaseSource).toBe('technician');
		expect(result.report.boundaries).toEqual({
			ignitionOn: { startS: 0, endS: 2.5 },
			idle: { startS: 7, endS: 13 }
		});
		expect(await db.Reading.count({ where: { vehicleId: vanId, source: 'capture' } })).toBe(1);
		const bad = await workshop.request(`/workshop/vans/${vanId}/tests/${testId}?/phases`, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
			body: new URLSearchParams({ 'idle.startS': '9', 'idle.endS': '4' })
		});
		expect(bad.status).toBe(400);
		expect(await bad.text()).toContain('The end must come after the start');
	});

	it('shows the test page with the safety cautions', async () => {
		const page = await workshop.request(`/workshop/vans/${vanId}/tests/${testId}`, {
			headers: { accept: 'text/html' }
		});
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('exhaust gases in an enclosed space');
		expect(html).toContain('chock the wheels');
		expect(html).toContain('<svg');
	});

	it('lets the van fleet and the uploader download the file, and no one else', async () => {
		const uploadId = (await db.SensorTest.findByPk(testId))!.uploadId!;
		const mine = await workshop.request(`/api/v1/uploads/${uploadId}`);
		expect(mine.status).toBe(200);
		expect(
			createHash('sha256')
				.update(Buffer.from(await mine.arrayBuffer()))
				.digest('hex')
		).toBe(createHash('sha256').update(csv).digest('hex'));
		expect((await fleet.request(`/api/v1/uploads/${uploadId}`)).status).toBe(200);
		expect((await otherFleet.request(`/api/v1/uploads/${uploadId}`)).status).toBe(404);
		expect((await otherWorkshop.request(`/api/v1/uploads/${uploadId}`)).status).toBe(404);
	});

	it('names the line and column of a bad sample and keeps nothing', async () => {
		const before = await db.Upload.count();
		const res = await upload(workshop, vanId, 'time,volts\n0,0.5\n0.001,0.51\n0.002,abc\n');
		expect(res.status).toBe(400);
		expect(((await res.json()) as any).error.message).toMatch(
			/Line 4, column 2: expected a number for volts, found "abc"/
		);
		expect(await db.Upload.count()).toBe(before);
	});

	it('refuses a binary file by its content', async () => {
		const res = await upload(
			workshop,
			vanId,
			new Uint8Array([0x25, 0x50, 0x44, 0x46, 0x2d, 0x31, 0x2e, 0x37, 0x0a]),
			'scope.csv'
		);
		expect(res.status).toBe(400);
		expect(((await res.json()) as any).error.message).toMatch(
			/not a text \(CSV\) file: it looks like a PDF document/
		);
	});

	it('is for workshops, on vans they may see', async () => {
		expect((await upload(fleet, vanId, csv.slice(0, 2000))).status).toBe(403);
		expect((await upload(otherWorkshop, vanId, csv.slice(0, 2000))).status).toBe(404);
	});
});

describe('vacuum range checks', () => {
	it('judges the steps entered in the form and saves the check on the van', async () => {
		// An ideal 0–1000 mbar sensor: volts from the transfer function at each applied vacuum
		// (1 inHg = 33.86389 mbar, NIST SP 811 App. B.8; V = 0.5 + Δp / 250, common trade practice)
		const form = new URLSearchParams({ sensorTypeId: '' });
		[5, 10, 15, 20, 25].forEach((inHg, i) => {
			form.set(`applied.${i}`, String(inHg));
			form.set(`unit.${i}`, 'inHg');
			form.set(`volts.${i}`, (0.5 + (inHg * 33.86389) / 250).toFixed(3));
		});
		const res = await workshop.request(`/workshop/vans/${vanId}/tests?/vacuum`, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
			body: form
		});
		expect(res.status).toBe(303);
		const id = Number(/tests\/(\d+)$/.exec(res.headers.get('location')!)![1]);
		const test = await db.SensorTest.findByPk(id);
		expect(test).toMatchObject({ kind: 'vacuum', vehicleId: vanId, verdict: 'good' });
		expect((test!.result as any).report.steps).toHaveLength(5);
		const page = await (
			await workshop.request(res.headers.get('location')!, { headers: { accept: 'text/html' } })
		).text();
		expect(page).toContain('Vacuum range check');
		expect(page).toContain('vacuum pumps and gauges only within their rated range');
	});

	it('says which step is not a number', async () => {
		const res = await workshop.request(`/workshop/vans/${vanId}/tests?/vacuum`, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
			body: new URLSearchParams({ 'applied.0': '10', 'unit.0': 'inHg', 'volts.0': 'high' })
		});
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('Step 1: enter the voltage read as a number');
	});
});
