import { expect, test, type Page } from '@playwright/test';
import { ACCOUNTS, open, signIn, expectAccessible } from './helpers';

const addDays = (day: string, n: number) =>
	new Date(Date.parse(`${day}T12:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);
/** The first weekday (Monday to Friday) on or after `day`. */
function weekdayFrom(day: string): string {
	let d = day;
	while ([0, 6].includes(new Date(`${d}T12:00:00Z`).getUTCDay())) d = addDays(d, 1);
	return d;
}
const today = new Date().toISOString().slice(0, 10);
// Far enough ahead of the days tests/e2e/visits.spec.ts books, and cleared again at the end.
const closedDay = weekdayFrom(addDays(today, 9));
const visitDay = weekdayFrom(addDays(closedDay, 1));

async function signOut(page: Page) {
	await page.getByRole('button', { name: 'Sign out' }).click();
	await expect(page).toHaveURL(/\/login/);
}

async function saveHours(page: Page, opensAt: string, closesAt: string) {
	await page.getByLabel('Opens at').fill(opensAt);
	await page.getByLabel('Closes at').fill(closesAt);
	await page.getByRole('button', { name: 'Save bays and hours' }).click();
}

test.describe.serial('workshop capacity, and a visit requested from the risk board', () => {
	test('the workshop changes its hours and adds a closed day', async ({ page }) => {
		await signIn(page, ACCOUNTS.workshop.email);
		await page.getByRole('link', { name: 'Capacity', exact: true }).click();
		await expect(page.getByRole('heading', { level: 1, name: 'Capacity' })).toBeVisible();
		await page.locator('html[data-ready="true"]').waitFor();
		await expectAccessible(page);

		// Closing before opening is refused beside the field, and the summary takes focus.
		await saveHours(page, '17:00', '08:00');
		await expect(page.getByRole('alert')).toContainText('Closing time must be after opening time');
		await expect(page.getByRole('alert')).toBeFocused();
		await expect(page.getByLabel('Closes at')).toHaveAttribute('aria-invalid', 'true');
		await expectAccessible(page);

		await saveHours(page, '08:00', '18:00');
		await expect(page.getByRole('status')).toContainText('Bays and opening hours are saved');
		await expect(page.getByLabel('Closes at')).toHaveValue('18:00');

		// A date already past has its own message.
		await page.getByLabel('Date').fill('2020-01-06');
		await page.getByLabel('Reason').fill('Too late');
		await page.getByRole('button', { name: 'Add closed day' }).click();
		await expect(page.getByRole('alert')).toContainText('2020-01-06 has already passed.');

		await page.getByLabel('Date').fill(closedDay);
		await page.getByLabel('Reason').fill('Staff training');
		await page.getByRole('button', { name: 'Add closed day' }).click();
		await expect(page.getByRole('status')).toContainText('The closed day is added');
		await expect(page.getByRole('list', { name: 'Upcoming closed days' })).toContainText(
			'Staff training'
		);
	});

	test('the fleet manager requests a visit from the risk board, checked against the new capacity', async ({
		page
	}) => {
		await signIn(page, ACCOUNTS.fleetManager.email);
		// The second van: the first is the one tests/e2e/visits.spec.ts books.
		const row = page
			.getByRole('table', { name: /Vans, most urgent first/ })
			.getByRole('row')
			.nth(2);
		const registration = (await row.getByRole('link').first().textContent())!.trim();
		await row.getByRole('link', { name: `Request a visit for ${registration}` }).click();
		await expect(
			page.getByRole('heading', { level: 1, name: `Request a visit for ${registration}` })
		).toBeVisible();
		await expect(page.getByText(/Suggested window:/)).toBeVisible();
		await page.locator('html[data-ready="true"]').waitFor();

		await page
			.getByLabel('Workshop', { exact: true })
			.selectOption({ label: 'Fenwright Diesel Clinic' });
		await page.getByLabel('Kind of visit').selectOption('inspection');
		await page.getByLabel('Start', { exact: true }).fill(`${closedDay}T10:00`);
		await page.getByRole('button', { name: 'Send the request' }).click();
		await expect(page.getByRole('alert')).toContainText(
			`Fenwright Diesel Clinic is closed on ${closedDay} (Staff training)`
		);
		// 17:00–18:00 fits only the hours saved above (the seeded ones end at 17:30).
		await page.getByLabel('Start', { exact: true }).fill(`${visitDay}T17:00`);
		await page.getByRole('button', { name: 'Send the request' }).click();
		await expect(page.getByRole('status')).toContainText('Your request is sent');
		const visitUrl = page.url();

		// Back on the board the van shows its visit instead of the request.
		await page.getByRole('link', { name: 'Vans', exact: true }).click();
		const same = page
			.getByRole('table', { name: /Vans, most urgent first/ })
			.getByRole('row', { name: new RegExp(registration) });
		await expect(same.getByText('Requested', { exact: true })).toBeVisible();
		await expect(same.getByRole('link', { name: /Request a visit/ })).toHaveCount(0);
		await same.getByRole('link', { name: `See the visit for ${registration}` }).click();
		await expect(page).toHaveURL(visitUrl.replace(/\?.*$/, ''));

		// Cleared again, so other journeys find the van free.
		await page.getByLabel('Reason for cancelling').fill('Only a rehearsal');
		await page.getByRole('button', { name: 'Cancel the visit' }).click();
		await expect(page.getByRole('status')).toContainText('The visit is cancelled');
		await signOut(page);
	});

	test('the workshop removes the closed day after confirming, and restores its hours', async ({
		page
	}) => {
		await signIn(page, ACCOUNTS.workshop.email);
		await open(page, '/workshop/capacity');
		const remove = page.getByRole('link', { name: /^Remove the closed day on / });
		await remove.click();
		await expect(page.getByRole('heading', { name: /^Open again on / })).toBeFocused();
		await page.getByRole('link', { name: 'Keep it closed' }).click();
		await expect(page.getByRole('list', { name: 'Upcoming closed days' })).toContainText(
			'Staff training'
		);

		await remove.click();
		await page.getByRole('button', { name: 'Remove the closed day' }).click();
		await expect(page.getByRole('status')).toContainText('The closed day is removed');
		await expect(page.getByText('No closed days ahead')).toBeVisible();

		await saveHours(page, '07:30', '17:30');
		await expect(page.getByRole('status')).toContainText('Bays and opening hours are saved');
	});
});

test('a visit request starts from the board by keyboard on a phone @phone', async ({ page }) => {
	await signIn(page, ACCOUNTS.fleetManager.email);
	const request = page.getByRole('link', { name: /^Request a visit for / }).first();
	await expect(request).toBeVisible();
	const name = (await request.getAttribute('href'))!;
	await request.focus();
	await page.keyboard.press('Enter');
	await expect(page).toHaveURL(new RegExp(`${name}$`));
	await expect(
		page.getByRole('heading', { level: 1, name: /^Request a visit for / })
	).toBeVisible();
	await expect(page.getByText(/Suggested window:/)).toBeVisible();
});
