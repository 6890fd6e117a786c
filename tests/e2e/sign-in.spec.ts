import { expect, test } from '@playwright/test';
import { ACCOUNTS, open, signIn } from './helpers';

test.describe('each role signs in and lands in its own area', () => {
	const cases = [
		{ email: ACCOUNTS.fleetManager.email, url: /\/fleet$/, heading: 'Risk board' },
		{ email: ACCOUNTS.workshop.email, url: /\/workshop$/, heading: 'Workshop queue' },
		{ email: ACCOUNTS.driver.email, url: /\/driver$/, heading: 'My van' },
		{ email: ACCOUNTS.admin.email, url: /\/admin$/, heading: 'Organisations and people' }
	];
	for (const c of cases) {
		test(`${c.email} lands on ${c.heading}`, async ({ page }) => {
			await signIn(page, c.email);
			await expect(page).toHaveURL(c.url);
			await expect(page.getByRole('heading', { level: 1, name: c.heading })).toBeVisible();
		});
	}
});

test('a wrong password shows one neutral message and focuses it', async ({ page }) => {
	await open(page, '/login');
	await page.getByLabel('E-mail').fill(ACCOUNTS.workshop.email);
	await page.getByLabel('Password').fill('not-the-password');
	await page.getByRole('button', { name: 'Sign in' }).click();
	const alert = page.getByRole('alert');
	await expect(alert).toContainText('That e-mail and password do not match an account.');
	await expect(alert).toBeFocused();
});

test('a driver opening the fleet area gets a clear 403 page', async ({ page }) => {
	await signIn(page, ACCOUNTS.driver.email);
	const response = await page.goto('/fleet');
	expect(response?.status()).toBe(403);
	await expect(page.getByRole('heading', { level: 1 })).toHaveText(
		'This part of Sootcast is for another role.'
	);
});

test('a signed-out visitor is sent to sign in and comes back to the page asked for', async ({
	page
}) => {
	await open(page, '/settings');
	await expect(page).toHaveURL(/\/login\?redirectTo=%2Fsettings/);
	await page.getByLabel('E-mail').fill(ACCOUNTS.fleetManager.email);
	await page.getByLabel('Password').fill('sootcast-demo');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page).toHaveURL(/\/settings$/);
});

test('the fleet manager finds a van by registration and opens its page', async ({ page }) => {
	await signIn(page, ACCOUNTS.fleetManager.email);
	await page.getByLabel('Registration').fill('LKD 404');
	await page.getByRole('button', { name: 'Search' }).click();
	await expect(page).toHaveURL(/q=LKD\+404/);
	await expect(page.getByRole('status').filter({ hasText: /^1 van$/ })).toBeVisible();
	await page.getByRole('link', { name: 'LKD 404' }).first().click();
	await expect(page.getByRole('heading', { level: 1, name: 'LKD 404' })).toBeVisible();
	await expect(page.getByRole('table', { name: /Differential pressure readings/ })).toBeVisible();
});

test('changing the pressure unit shows readings in that unit @phone', async ({ page }) => {
	await signIn(page, ACCOUNTS.driver.email);
	await page.getByRole('link', { name: 'Settings' }).click();
	await page.getByLabel('Show pressures in').selectOption('kPa');
	await page.getByRole('button', { name: 'Save settings' }).click();
	await expect(page.getByRole('status')).toContainText('saved');
	await page.getByRole('link', { name: 'My van' }).click();
	await expect(page.getByText(/kPa/).first()).toBeVisible();
});
