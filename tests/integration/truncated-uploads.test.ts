import fs from 'node:fs';
import { beforeAll, describe, expect, inject, it } from 'vitest';
import { Client } from './http';
import { DEMO_ACCOUNTS } from '../../src/lib/server/demo/scenario';

// A signed-in person posting a form that breaks off mid-file must get an answer for that
// request, leave nothing stored, and leave the server running for everyone else.
const baseUrl = inject('baseUrl');
const storageDir = inject('storageDir');
const fleet = new Client(baseUrl);
const workshop = new Client(baseUrl);
let db: typeof import('../../src/lib/server/db');
let vanId = 0;
let reportVanId = 0;

const BOUNDARY = '----sootcast-cut-off-test';

/** A multipart body whose file part starts and never ends: no closing boundary. */
function cutOffBody(fields: Record<string, string>, fileField: string, fileName: string): string {
	const parts = Object.entries(fields).map(
		([k, v]) => `--${BOUNDARY}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`
	);
	const head = `--${BOUNDARY}\r\nContent-Disposition: form-data; name="${fileField}"; filename="${fileName}"\r\nContent-Type: text/csv\r\n\r\n`;
	const someRows = Array.from({ length: 200 }, (_, i) => `${i * 0.01},0.9${i % 10}`).join('\n');
	return parts.join('') + head + 'time_s,volts\n' + someRows;
}

function postCutOff(client: Client, pathname: string, body: string) {
	return client.request(pathname, {
		method: 'POST',
		headers: { 'content-type': `multipart/form-data; boundary=${BOUNDARY}`, accept: 'text/html' },
		body
	});
}

function storedFiles(): number {
	if (!fs.existsSync(storageDir)) return 0;
	return fs
		.readdirSync(storageDir, { recursive: true, withFileTypes: true })
		.filter((e) => e.isFile()).length;
}

async function serverStillAnswers() {
	const health = await fetch(baseUrl + '/api/health');
	expect(health.status).toBe(200);
}

beforeAll(async () => {
	process.env.DATABASE_URL = inject('databaseUrl');
	db = await import('../../src/lib/server/db');
	db.getDb();
	vanId = (await db.Vehicle.findOne({ where: { registration: 'LKD 420' } }))!.id;
	reportVanId = (await db.Vehicle.findOne({ where: { registration: 'LKD 433' } }))!.id;
	expect((await fleet.signIn(DEMO_ACCOUNTS.fleetManager.email)).status).toBe(303);
	expect((await workshop.signIn(DEMO_ACCOUNTS.workshop.email)).status).toBe(303);
});

describe('an upload cut off mid-file', () => {
	it('on the readings import answers 400, stores nothing and the server keeps running', async () => {
		const [uploads, files] = [await db.Upload.count(), storedFiles()];
		const res = await postCutOff(
			fleet,
			'/fleet/imports?/upload',
			cutOffBody({ kind: 'readings' }, 'file', 'readings.csv')
		);
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('cut off before the end');
		await serverStillAnswers();
		expect(await db.Upload.count()).toBe(uploads);
		expect(storedFiles()).toBe(files);
	});

	it('on the capture upload answers 400, stores no test and the server keeps running', async () => {
		const [tests, uploads, files] = [
			await db.SensorTest.count(),
			await db.Upload.count(),
			storedFiles()
		];
		const res = await postCutOff(
			workshop,
			`/workshop/vans/${vanId}/tests?/capture`,
			cutOffBody({ sensorTypeId: '' }, 'file', 'capture.csv')
		);
		expect(res.status).toBe(400);
		await serverStillAnswers();
		expect(await db.SensorTest.count()).toBe(tests);
		expect(await db.Upload.count()).toBe(uploads);
		expect(storedFiles()).toBe(files);
	});

	it('on a form with several files answers, stores nothing and the server keeps running', async () => {
		const [attachments, files] = [await db.VisitReportAttachment.count(), storedFiles()];
		// The visit report form reads several files; the visit id need not exist for the reader
		// to meet the broken body first, and a foreign or missing visit must never be a crash.
		const res = await postCutOff(
			workshop,
			`/workshop/visits/999999?/report`,
			cutOffBody({ findings: 'x' }, 'attachments', 'before.png')
		);
		expect([400, 404]).toContain(res.status);
		await serverStillAnswers();
		expect(await db.VisitReportAttachment.count()).toBe(attachments);
		expect(storedFiles()).toBe(files);
		expect(reportVanId).toBeGreaterThan(0);
	});
});
