import fs from 'node:fs';
import path from 'node:path';
import { expect, test, type Page } from '@playwright/test';
import { TZDate } from '@date-fns/tz';
import ICAL from 'ical.js';
import { simpleParser } from 'mailparser';
import sqlite3 from 'sqlite3';
import { ACCOUNTS, open, signIn } from './helpers';

// The launcher's local sink keeps messages here, and its database sits beside it (playwright.config.ts).
const dataDir = process.env.SOOTCAST_E2E_DIR ?? '';
const mailDir = path.join(dataDir, 'mailbox');

interface Invitation {
	method: string;
	uid: string;
	sequence: number;
	start: string;
}

/** Waits for a message to `to` whose subject matches, and parses its .ics with ical.js. */
async function invitation(to: string, subject: string): Promise<Invitation> {
	const until = Date.now() + 15_000;
	while (Date.now() < until) {
		const files = fs.existsSync(mailDir)
			? fs.readdirSync(mailDir).filter((f) => f.endsWith('.eml'))
			: [];
		for (const file of files) {
			const mail = await simpleParser(fs.readFileSync(path.join(mailDir, file)));
			const addresses = (Array.isArray(mail.to) ? mail.to : mail.to ? [mail.to] : []).flatMap((a) =>
				a.value.map((v) => v.address)
			);
			const ics = mail.attachments.find((a) => a.filename === 'visit.ics');
			if (addresses.includes(to) && mail.subject === subject && ics) {
				const cal = new ICAL.Component(ICAL.parse(ics.content.toString('utf8')));
				const event = new ICAL.Event(cal.getFirstSubcomponent('vevent')!);
				return {
					method: String(cal.getFirstPropertyValue('method')),
					uid: event.uid,
					sequence: event.sequence,
					start: event.startDate.toJSDate().toISOString()
				};
			}
		}
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error(`No message “${subject}” to ${to} arrived in the local sink.`);
}

function bookingUid(id: number): Promise<string> {
	const db = new sqlite3.Database(path.join(dataDir, 'sootcast.db'), sqlite3.OPEN_READONLY);
	return new Promise((resolve, reject) =>
		db.get(
			'SELECT uid FROM bookings WHERE id = ?',
			[id],
			(err, row: { uid: string } | undefined) => {
				db.close();
				if (err || !row) reject(err ?? new Error('no booking'));
				else resolve(row.uid);
			}
		)
	);
}

/** The next weekday at least `ahead` days from today, as 'YYYY-MM-DD'. */
function weekdayAhead(ahead: number): string {
	const d = new Date(Date.now() + ahead * 86_400_000);
	while (d.getUTCDay() === 0 || d.getUTCDay() === 6) d.setUTCDate(d.getUTCDate() + 1);
	return d.toISOString().slice(0, 10);
}

/** A wall-clock time at Fenwright (Europe/London, its seeded zone) as a UTC ISO string. */
const londonToUtc = (day: string, hhmm: string) => {
	const [y, m, d] = day.split('-').map(Number);
	const [h, mi] = hhmm.split(':').map(Number);
	return new Date(new TZDate(y, m - 1, d, h, mi, 'Europe/London').getTime()).toISOString();
};

async function signOut(page: Page) {
	await page.getByRole('button', { name: 'Sign out' }).click();
	await expect(page).toHaveURL(/\/login/);
}

test('a visit is requested, confirmed, moved and cancelled, with calendar invitations to both sides', async ({
	page
}) => {
	test.setTimeout(90_000);
	const manager = ACCOUNTS.fleetManager.email;
	const workshop = ACCOUNTS.workshop.email;
	const firstDay = weekdayAhead(3);
	const secondDay = weekdayAhead(6);

	// The fleet manager asks Fenwright for a visit from the most urgent van's page.
	await signIn(page, manager);
	const first = page
		.getByRole('table', { name: /Vans, most urgent first/ })
		.getByRole('row')
		.nth(1);
	const registration = (await first.getByRole('link').first().textContent())!.trim();
	await first.getByRole('link').first().click();
	// The board offers "Request a visit for …" on every row too: wait for the van's own page.
	await expect(page.getByRole('heading', { level: 1, name: registration })).toBeVisible();
	await page.getByRole('link', { name: 'Request a visit', exact: true }).click();
	await expect(
		page.getByRole('heading', { level: 1, name: `Request a visit for ${registration}` })
	).toBeVisible();
	await expect(page.getByText(/Suggested window:/)).toBeVisible();
	await expect(page.getByRole('complementary', { name: 'Safety' })).toContainText('enclosed space');
	await page
		.getByLabel('Workshop', { exact: true })
		.selectOption({ label: 'Fenwright Diesel Clinic' });
	await page.getByLabel('Kind of visit').selectOption('inspection');
	await page.getByLabel('Start', { exact: true }).fill(`${firstDay}T10:00`);
	await page.getByRole('button', { name: 'Send the request' }).click();
	await expect(page.getByRole('status')).toContainText('Your request is sent');
	const bookingId = Number(/\/fleet\/visits\/(\d+)/.exec(page.url())![1]);
	const uid = await bookingUid(bookingId);
	await signOut(page);

	// The workshop confirms it.
	await signIn(page, workshop);
	await open(page, '/workshop/visits');
	await page.getByRole('link', { name: new RegExp(`^${registration} —`) }).click();
	await page.getByRole('button', { name: 'Confirm the visit' }).click();
	await expect(page.getByRole('status')).toContainText('The visit is confirmed');
	await expect(page.getByText('Confirmed', { exact: true }).first()).toBeVisible();

	// Both sides receive the invitation: same UID as the booking, 10:00 London time, SEQUENCE 1.
	for (const to of [manager, workshop]) {
		const confirmed = await invitation(to, `Visit confirmed for ${registration}`);
		// RFC 5545 §3.8.4.7 UID (stable), §3.8.7.4 SEQUENCE, §3.8.2.4 DTSTART; RFC 5546 §3.2.2 METHOD:REQUEST.
		expect(confirmed).toEqual({
			method: 'REQUEST',
			uid,
			sequence: 1,
			start: londonToUtc(firstDay, '10:00')
		});
	}
	const requested = await invitation(workshop, `Visit requested for ${registration}`);
	expect(requested).toEqual({
		method: 'REQUEST',
		uid,
		sequence: 0,
		start: londonToUtc(firstDay, '10:00')
	});

	// The workshop moves it: SEQUENCE rises, the time changes, the UID stays.
	await page.getByLabel('New start').fill(`${secondDay}T14:00`);
	await page.getByLabel('Reason for the new time').fill('A part arrives that morning');
	await page.getByRole('button', { name: 'Propose this time' }).click();
	await expect(page.getByRole('status')).toContainText('The new time is sent');
	const moved = await invitation(manager, `New time proposed for ${registration}'s visit`);
	expect(moved).toEqual({
		method: 'REQUEST',
		uid,
		sequence: 2,
		start: londonToUtc(secondDay, '14:00')
	});

	// A request outside opening hours is refused with its own message.
	await page.getByLabel('New start').fill(`${secondDay}T19:00`);
	await page.getByLabel('Reason for the new time').fill('Evening slot');
	await page.getByRole('button', { name: 'Propose this time' }).click();
	await expect(page.getByRole('alert')).toContainText(
		'Fenwright Diesel Clinic is open 07:30–17:30'
	);

	// Then cancels it: METHOD:CANCEL.
	await page.getByLabel('Reason for cancelling').fill('Technician off sick');
	await page.getByRole('button', { name: 'Cancel the visit' }).click();
	await expect(page.getByRole('status')).toContainText('The visit is cancelled');
	for (const to of [manager, workshop]) {
		const cancelled = await invitation(to, `Visit cancelled for ${registration}`);
		// RFC 5546 §3.2.5 CANCEL; RFC 5545 §3.8.7.4 SEQUENCE raised once more.
		expect(cancelled).toEqual({
			method: 'CANCEL',
			uid,
			sequence: 3,
			start: londonToUtc(secondDay, '14:00')
		});
	}
});
