import { expect, test, type Page } from '@playwright/test';
import { ACCOUNTS, open, signIn, expectAccessible } from './helpers';

// `npm run screenshots` sets SCREENSHOTS=1 to refresh docs/screenshots; a normal test run
// checks the same pages without touching the repository.
const SHOTS = process.env.SCREENSHOTS === '1';

async function shoot(page: Page, name: string) {
	if (SHOTS) await page.screenshot({ path: `docs/screenshots/${name}.png`, fullPage: true });
}

test.describe('each role does its main job', () => {
	test('the fleet manager finds the most urgent van and opens its story', async ({ page }) => {
		await signIn(page, ACCOUNTS.fleetManager.email);
		await expect(page.getByRole('heading', { level: 1, name: 'Risk board' })).toBeVisible();
		await expectAccessible(page);
		await shoot(page, 'fleet-risk-board');

		// The board is sorted most urgent first; the first row is the van to look at.
		const first = page
			.getByRole('table', { name: /Vans, most urgent first/ })
			.getByRole('row')
			.nth(1);
		await expect(first.getByText(/Over the line|Crossing soon/)).toBeVisible();
		const registration = (await first.getByRole('link').first().textContent())!.trim();
		await first.getByRole('link').first().click();
		await expect(page.getByRole('heading', { level: 1, name: registration })).toBeVisible();
		await expect(page.getByRole('heading', { name: 'Forecast' })).toBeVisible();
		await expect(
			page.getByRole('heading', { name: 'Why it loads up, and what to do' })
		).toBeVisible();
		await expectAccessible(page);
		await shoot(page, 'fleet-van-story');
	});

	test('the fleet manager filters the board by status and the view stays in the address', async ({
		page
	}) => {
		await signIn(page, ACCOUNTS.fleetManager.email);
		await page.getByLabel('Status', { exact: true }).selectOption('healthy');
		await expect(page).toHaveURL(/status=healthy/);
		await expect(page.getByRole('table', { name: /Vans/ }).getByText('Over the line')).toHaveCount(
			0
		);
		await page.reload();
		await expect(page.getByLabel('Status', { exact: true })).toHaveValue('healthy');
		const download = page.waitForEvent('download');
		await page.getByRole('link', { name: 'Download this view (CSV)' }).click();
		const file = await download;
		expect(file.suggestedFilename()).toMatch(/^sootcast-vans-\d{4}-\d{2}-\d{2}\.csv$/);
	});

	test('the workshop opens its queue and a van', async ({ page }) => {
		await signIn(page, ACCOUNTS.workshop.email);
		await expect(page.getByRole('heading', { level: 1, name: 'Workshop queue' })).toBeVisible();
		await expect(page.getByRole('heading', { name: 'What to check' }).first()).toBeVisible();
		await expectAccessible(page);
		await shoot(page, 'workshop-queue');
		await page
			.getByRole('listitem')
			.getByRole('link', { name: /^LKD \d+$/ })
			.first()
			.click();
		await expect(page).toHaveURL(/\/workshop\/vans\/\d+$/);
		await expect(page.getByRole('link', { name: 'Record a test', exact: true })).toBeVisible();
		await expectAccessible(page);
	});

	test('the driver reads this week’s advice @phone', async ({ page }) => {
		await signIn(page, ACCOUNTS.driver.email);
		await expect(page.getByRole('heading', { level: 1, name: 'My van' })).toBeVisible();
		await expect(page.getByRole('heading', { name: "This week's advice" })).toBeVisible();
		await expect(page.getByText(/trips last week/).first()).toBeVisible();
		await expectAccessible(page);
		await shoot(page, 'driver-my-van');
	});

	test('the administrator sees organisations, people, contracts and job runs', async ({ page }) => {
		await signIn(page, ACCOUNTS.admin.email);
		await expect(
			page.getByRole('table', { name: 'Contracts between fleets and workshops' })
		).toBeVisible();
		await expectAccessible(page);
		await shoot(page, 'admin-overview');
		await page.getByRole('link', { name: 'Job runs' }).click();
		await expect(page.getByRole('cell', { name: 'forecast' }).first()).toBeVisible();
		await expectAccessible(page);
	});

	test('the sign-in and settings pages are accessible', async ({ page }) => {
		await open(page, '/login');
		await expectAccessible(page);
		await shoot(page, 'sign-in');
		await signIn(page, ACCOUNTS.fleetManager.email);
		await page.goto('/settings');
		await expectAccessible(page);
	});
});
