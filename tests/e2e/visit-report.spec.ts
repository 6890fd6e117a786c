import path from 'node:path';
import zlib from 'node:zlib';
import { expect, request, test, type APIRequestContext, type Page } from '@playwright/test';
import { TZDate } from '@date-fns/tz';
import sqlite3 from 'sqlite3';
import { DEMO_PASSWORD } from '../../src/lib/server/demo/scenario';
import { baseURL } from '../../playwright.config';
import { ACCOUNTS, open, signIn, expectAccessible } from './helpers';

// The launcher's database sits in this folder (playwright.config.ts).
const dataDir = process.env.SOOTCAST_E2E_DIR ?? '';
const VAN = 'LKD 437';

/**
 * A real 8×8 PNG in one colour: signature, IHDR, one zlib-compressed IDAT, IEND, each chunk
 * with its CRC-32 (PNG specification, 3rd ed., 5.2–5.3 and 11.2).
 */
function tinyPng(): Buffer {
	const chunk = (type: string, data: Buffer) => {
		const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
		const out = Buffer.alloc(12 + data.length);
		out.writeUInt32BE(data.length, 0);
		body.copy(out, 4);
		out.writeUInt32BE(zlib.crc32(body), 8 + data.length);
		return out;
	};
	const header = Buffer.alloc(13);
	header.writeUInt32BE(8, 0); // width
	header.writeUInt32BE(8, 4); // height
	header.set([8, 2, 0, 0, 0], 8); // 8-bit RGB, no interlace
	const row = Buffer.from([0, ...Array.from({ length: 8 }, () => [0xb4, 0x62, 0x1f]).flat()]);
	return Buffer.concat([
		Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
		chunk('IHDR', header),
		chunk('IDAT', zlib.deflateSync(Buffer.concat(Array.from({ length: 8 }, () => row)))),
		chunk('IEND', Buffer.alloc(0))
	]);
}

function queryId(sql: string, value: string): Promise<number> {
	const db = new sqlite3.Database(path.join(dataDir, 'sootcast.db'), sqlite3.OPEN_READONLY);
	return new Promise((resolve, reject) =>
		db.get(sql, [value], (err, row: { id: number } | undefined) => {
			db.close();
			if (err || !row) reject(err ?? new Error(`nothing for ${value}`));
			else resolve(row.id);
		})
	);
}

/** Posts a form as the signed-in person of `api` would; answers the redirect's address. */
async function postForm(api: APIRequestContext, url: string, form: Record<string, string>) {
	const res = await api.post(url, {
		form,
		headers: { origin: baseURL, accept: 'text/html' },
		maxRedirects: 0
	});
	expect(res.status(), await res.text()).toBe(303);
	return res.headers()['location'];
}

async function signedInApi(email: string) {
	const api = await request.newContext({ baseURL });
	await postForm(api, '/login', { email, password: DEMO_PASSWORD });
	return api;
}

/** The photo is shown, and decoded: the guarded address served real image bytes. */
async function expectThumbnail(page: Page, fileName: string) {
	const img = page.getByRole('img', { name: `Photo attached to the report: ${fileName}` });
	await expect(img).toBeVisible();
	await expect.poll(() => img.evaluate((el: HTMLImageElement) => el.naturalWidth)).toBe(8);
}

let vanId = 0;
let bookingId = 0;

// A confirmed visit to report on, set up through the app's own forms rather than by clicking.
test.beforeAll(async () => {
	vanId = await queryId('SELECT id FROM vehicles WHERE registration = ?', VAN);
	const workshopId = await queryId(
		'SELECT id FROM organisations WHERE name = ?',
		'Fenwright Diesel Clinic'
	);
	const day = new Date(Date.now() + 2 * 86_400_000);
	while (day.getUTCDay() === 0 || day.getUTCDay() === 6) day.setUTCDate(day.getUTCDate() + 1);
	const fleet = await signedInApi(ACCOUNTS.fleetManager.email);
	const requested = await postForm(fleet, `/fleet/vans/${vanId}/visit?/request`, {
		workshopId: String(workshopId),
		visitKind: 'inspection',
		startsAt: `${day.toISOString().slice(0, 10)}T10:00`
	});
	bookingId = Number(/\/fleet\/visits\/(\d+)/.exec(requested)![1]);
	const shop = await signedInApi(ACCOUNTS.workshop.email);
	await postForm(shop, `/workshop/visits/${bookingId}?/confirm`, {});
	await fleet.dispose();
	await shop.dispose();
});

test('the workshop files a visit report with a photo, and the fleet manager sees both', async ({
	page
}) => {
	test.setTimeout(90_000);
	await signIn(page, ACCOUNTS.workshop.email);
	await open(page, `/workshop/visits/${bookingId}`);
	const form = page.locator('form[action="?/report"]');
	await expect(page.getByRole('heading', { name: 'Report the visit' })).toBeVisible();
	await expect(form.getByRole('complementary', { name: 'Safety' })).toContainText('enclosed space');
	await expectAccessible(page);

	// An hour ago at Fenwright (Europe/London): the work cannot be dated in the future.
	const done = new TZDate(Date.now() - 3_600_000, 'Europe/London');
	const p = (n: number) => String(n).padStart(2, '0');
	await page
		.getByLabel('Work done at')
		.fill(
			`${done.getFullYear()}-${p(done.getMonth() + 1)}-${p(done.getDate())}T${p(done.getHours())}:${p(done.getMinutes())}`
		);
	await page.getByLabel('Δp at idle before the work (mbar)').fill('96');
	await page.getByLabel('Δp at idle after the work (mbar)').fill('24');
	await page.getByLabel('Off-vehicle filter cleaning').check();
	await page.getByLabel('Findings', { exact: true }).fill('Heavy ash load at the inlet face.');
	await page.getByLabel('Photos and documents').setInputFiles({
		name: 'dpf-inlet.png',
		mimeType: 'image/png',
		buffer: tinyPng()
	});
	await page.getByLabel('I sign off this report').check();
	await page.getByRole('button', { name: 'Save the report' }).click();
	await expect(page.getByRole('status')).toContainText('The visit report is saved');

	await page.getByRole('link', { name: 'Read the visit report' }).click();
	await expect(
		page.getByRole('heading', { level: 1, name: `Visit report · ${VAN}` })
	).toBeVisible();
	await expect(page.getByText('Off-vehicle filter cleaning')).toBeVisible();
	await expectThumbnail(page, 'dpf-inlet.png');
	await expectAccessible(page);
	await page.getByRole('button', { name: 'Sign out' }).click();
	await expect(page).toHaveURL(/\/login/);

	// The fleet manager finds the report from the van's page, with the photo.
	await signIn(page, ACCOUNTS.fleetManager.email);
	await open(page, `/fleet/vans/${vanId}`);
	const visits = page.locator('section', {
		has: page.getByRole('heading', { name: 'Visits', exact: true })
	});
	await expect(visits).toContainText('(1 file)');
	await visits.getByRole('link', { name: 'report', exact: true }).click();
	await expect(
		page.getByRole('heading', { level: 1, name: `Visit report · ${VAN}` })
	).toBeVisible();
	await expect(page.getByText('Heavy ash load at the inlet face.')).toBeVisible();
	await expect(page.getByText('Signed off by Tomas Reyne')).toBeVisible();
	await expectThumbnail(page, 'dpf-inlet.png');
	await expect(page.locator('form[action="?/remove"]')).toHaveCount(0);
	await expectAccessible(page);
});
