import { createHash } from 'node:crypto';
import fs from 'node:fs';
import { beforeAll, describe, expect, inject, it } from 'vitest';
import { Client } from './http';
import { waitForMail } from './mail';
import { DEMO_ACCOUNTS } from '../../src/lib/server/demo/scenario';
import { toLocal } from '../../src/lib/server/services/bookings';

const baseUrl = inject('baseUrl');
const workshop = new Client(baseUrl);
const fleet = new Client(baseUrl);
const otherFleet = new Client(baseUrl);
const otherWorkshop = new Client(baseUrl);
const anonymous = new Client(baseUrl);
// The shared server's storage folder (global-setup.ts)
const storageDir = inject('storageDir');
let db: typeof import('../../src/lib/server/db');
let vanId = 0;
let bookingId = 0;
let reportId = 0;

// check values: the eight-byte PNG signature (PNG spec 5.2) and "%PDF-" (ISO 32000-1, 7.5.2)
const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
const png = (extra = 64) =>
	Uint8Array.from([...PNG_SIGNATURE, ...Array.from({ length: extra }, (_, i) => i % 251)]);
const pdf = (note: string) => new TextEncoder().encode(`%PDF-1.4\n% ${note}\n%%EOF\n`);
const photo = png(300);

type Part = { name: string; bytes: Uint8Array; type: string };
const file = (name: string, bytes: Uint8Array, type = 'application/octet-stream'): Part => ({
	name,
	bytes,
	type
});

function post(client: Client, pathname: string, fields: Record<string, string>, files: Part[]) {
	const form = new FormData();
	for (const [k, v] of Object.entries(fields)) form.append(k, v);
	for (const f of files)
		form.append('attachments', new Blob([f.bytes as BlobPart], { type: f.type }), f.name);
	return client.request(pathname, { method: 'POST', headers: { accept: 'text/html' }, body: form });
}
const attach = (client: Client, files: Part[]) =>
	post(client, `/workshop/reports/${reportId}?/attach`, {}, files);

function storedFileCount(): number {
	if (!fs.existsSync(storageDir)) return 0;
	return fs
		.readdirSync(storageDir, { recursive: true, withFileTypes: true })
		.filter((e) => e.isFile()).length;
}
const rowCount = () => db.VisitReportAttachment.count({ where: { visitReportId: reportId } });
const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

/** A weekday at least two days ahead, 10:00 (Fenwright opens 07:30–17:30 on weekdays). */
function nextWeekdayAt10(): string {
	const d = new Date(Date.now() + 2 * 86_400_000);
	while (d.getUTCDay() === 0 || d.getUTCDay() === 6) d.setUTCDate(d.getUTCDate() + 1);
	return `${d.toISOString().slice(0, 10)}T10:00`;
}

const reportFields = () => ({
	visitedAt: toLocal(new Date(Date.now() - 3_600_000), 'Europe/London'),
	idleBeforeMbar: '96',
	idleAfterMbar: '24',
	actions: 'filter_cleaning',
	findings: 'Heavy ash load; filter cleaned off the van.',
	signOff: 'on'
});

beforeAll(async () => {
	process.env.DATABASE_URL = inject('databaseUrl');
	db = await import('../../src/lib/server/db');
	db.getDb();
	vanId = (await db.Vehicle.findOne({ where: { registration: 'LKD 433' } }))!.id;
	const shop = await db.Organisation.findOne({ where: { name: 'Fenwright Diesel Clinic' } });
	for (const [client, who] of [
		[workshop, DEMO_ACCOUNTS.workshop],
		[fleet, DEMO_ACCOUNTS.fleetManager],
		[otherFleet, DEMO_ACCOUNTS.otherFleetManager],
		[otherWorkshop, DEMO_ACCOUNTS.otherWorkshop]
	] as const)
		expect((await client.signIn(who.email)).status).toBe(303);
	const requested = await fleet.request(`/fleet/vans/${vanId}/visit?/request`, {
		method: 'POST',
		headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
		body: new URLSearchParams({
			workshopId: String(shop!.id),
			visitKind: 'inspection',
			startsAt: nextWeekdayAt10()
		})
	});
	expect(requested.status).toBe(303);
	bookingId = Number(/\/fleet\/visits\/(\d+)/.exec(requested.headers.get('location')!)![1]);
	const confirmed = await workshop.request(`/workshop/visits/${bookingId}?/confirm`, {
		method: 'POST',
		headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
		body: new URLSearchParams()
	});
	expect(confirmed.status).toBe(303);
});

describe('attachments on a visit report', () => {
	it('refuses the whole report when one file is not a photo or PDF, and keeps nothing', async () => {
		const before = storedFileCount();
		const res = await post(workshop, `/workshop/visits/${bookingId}?/report`, reportFields(), [
			file('before.png', photo, 'image/png'),
			file('job-sheet.png', new TextEncoder().encode('Job sheet, typed up\n'), 'image/png')
		]);
		expect(res.status).toBe(400);
		const html = await res.text();
		expect(html).toContain(
			'“job-sheet.png” is not a photo (JPEG, PNG, WebP) or a PDF, whatever its name says.'
		);
		expect(html).toContain('No file from the last try was kept');
		expect(await db.VisitReport.count({ where: { bookingId } })).toBe(0);
		expect(storedFileCount()).toBe(before);
	});

	it('files the report with a photo, stored whole with its size and SHA-256', async () => {
		const res = await post(workshop, `/workshop/visits/${bookingId}?/report`, reportFields(), [
			file('before cleaning.png', photo, 'image/png')
		]);
		expect(res.status, await res.clone().text()).toBe(303);
		reportId = (await db.VisitReport.findOne({ where: { bookingId } }))!.id;
		const rows = await db.VisitReportAttachment.findAll({ where: { visitReportId: reportId } });
		expect(rows.map((r) => [r.fileName, r.mediaType, Number(r.sizeBytes), r.sha256])).toEqual([
			['before cleaning.png', 'image/png', photo.byteLength, sha256(photo)]
		]);
		const user = await db.User.findOne({ where: { email: DEMO_ACCOUNTS.workshop.email } });
		expect(rows[0].uploadedById).toBe(user!.id);
	});

	it('serves the file inline with its sniffed type to the fleet and the workshop that wrote it', async () => {
		const [row] = await db.VisitReportAttachment.findAll({ where: { visitReportId: reportId } });
		const url = `/api/v1/visit-reports/${reportId}/attachments/${row.id}`;
		for (const client of [workshop, fleet]) {
			const res = await client.request(url);
			expect(res.status).toBe(200);
			expect(res.headers.get('content-type')).toBe('image/png');
			expect(res.headers.get('content-disposition')).toMatch(
				/^inline; filename="before cleaning.png"/
			);
			expect(res.headers.get('x-content-type-options')).toBe('nosniff');
			expect(sha256(new Uint8Array(await res.arrayBuffer()))).toBe(sha256(photo));
		}
		const page = await (
			await fleet.request(`/fleet/reports/${reportId}`, { headers: { accept: 'text/html' } })
		).text();
		expect(page).toContain(`src="${url}"`);
		expect(page).toContain('before cleaning.png');
	});

	it('answers 404 to other organisations, the same as a missing file', async () => {
		const [row] = await db.VisitReportAttachment.findAll({ where: { visitReportId: reportId } });
		const url = `/api/v1/visit-reports/${reportId}/attachments/${row.id}`;
		expect((await otherFleet.request(url)).status).toBe(404);
		expect((await otherWorkshop.request(url)).status).toBe(404);
		expect((await fleet.request(`${url}0`)).status).toBe(404);
		expect((await anonymous.request(url)).status).toBe(401);
		const foreign = await post(otherWorkshop, `/workshop/reports/${reportId}?/attach`, {}, [
			file('x.pdf', pdf('x'), 'application/pdf')
		]);
		expect(foreign.status).toBe(404);
		expect(await rowCount()).toBe(1);
	});

	it('refuses a file by its content, naming it, whatever its name and declared type', async () => {
		const before = storedFileCount();
		const gif = await attach(workshop, [
			file(
				'bay-3.jpg',
				Uint8Array.from([0x47, 0x49, 0x46, 0x38, 0x39, 0x61, 1, 0, 1, 0, 0, 0, 0]),
				'image/jpeg'
			)
		]);
		expect(gif.status).toBe(400);
		expect(await gif.text()).toContain(
			'“bay-3.jpg” is not a photo (JPEG, PNG, WebP) or a PDF: it looks like a GIF image.'
		);
		expect(await rowCount()).toBe(1);
		expect(storedFileCount()).toBe(before);
	});

	it('refuses a file over 10 MB by name, and keeps none of the files sent with it', async () => {
		const before = storedFileCount();
		const res = await attach(workshop, [
			file('invoice.pdf', pdf('invoice'), 'application/pdf'),
			file('whole-bay.png', png(10 * 1024 * 1024), 'image/png')
		]);
		expect(res.status).toBe(413);
		expect(await res.text()).toContain('“whole-bay.png” is larger than the 10 MB a file may be.');
		expect(await rowCount()).toBe(1);
		expect(storedFileCount()).toBe(before);
	});

	it('holds at most 10 files per report, counting the ones already there', async () => {
		const pdfs = (n: number) =>
			Array.from({ length: n }, (_, i) => file(`sheet-${i + 1}.pdf`, pdf(`sheet ${i + 1}`)));
		const over = await attach(workshop, pdfs(10));
		expect(over.status).toBe(400);
		expect(await over.text()).toContain(
			'A report can hold at most 10 files. This one has 1, so choose at most 9 more.'
		);
		expect(await rowCount()).toBe(1);
		expect((await attach(workshop, pdfs(9))).status).toBe(303);
		expect(await rowCount()).toBe(10);
		const full = await attach(workshop, [file('one-more.pdf', pdf('one more'))]);
		expect(await full.text()).toContain('This one is full: remove a file first.');
		expect(await rowCount()).toBe(10);
	});

	it('removes a file for the workshop that wrote the report: row and bytes go together', async () => {
		const last = await db.VisitReportAttachment.findOne({
			where: { visitReportId: reportId },
			order: [['id', 'DESC']]
		});
		const remove = (client: Client) =>
			client.request(`/workshop/reports/${reportId}?/remove`, {
				method: 'POST',
				headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
				body: new URLSearchParams({ attachmentId: String(last!.id) })
			});
		expect((await remove(fleet)).status).toBe(403);
		expect((await remove(otherWorkshop)).status).toBe(404);
		const before = storedFileCount();
		expect((await remove(workshop)).status).toBe(303);
		expect(await db.VisitReportAttachment.findByPk(last!.id)).toBeNull();
		expect(storedFileCount()).toBe(before - 1);
		const gone = await fleet.request(`/api/v1/visit-reports/${reportId}/attachments/${last!.id}`);
		expect(gone.status).toBe(404);
	});

	it('tells the fleet in the report e-mail how many files there are, with a link and no file', async () => {
		const mail = await waitForMail(
			inject('mailDir'),
			DEMO_ACCOUNTS.fleetManager.email,
			/^Visit report for LKD 433 from Fenwright Diesel Clinic$/
		);
		expect(mail.text).toContain(
			`1 photo or document is attached to the report; open it there: ${baseUrl}/fleet/reports/${reportId}`
		);
		expect(mail.attachments).toEqual([]);
	});
});
