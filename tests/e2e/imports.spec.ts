import { expect, test, type Page } from '@playwright/test';
import { ACCOUNTS, signIn } from './helpers';

const VAN = 'LKD 405';
/** Whole seconds, hours ago, with an odd offset so no demo reading shares the time. */
const hoursAgo = (h: number) =>
	new Date(Math.floor(Date.now() / 1000) * 1000 - h * 3_600_000 - 41_000).toISOString();

async function uploadCsv(page: Page, name: string, csv: string) {
	await page.goto('/fleet/imports');
	await page.getByLabel('Δp readings').check();
	await page
		.getByLabel('CSV file')
		.setInputFiles({ name, mimeType: 'text/csv', buffer: Buffer.from(csv) });
	await page.getByRole('button', { name: 'Upload and map columns' }).click();
	await expect(page.getByRole('heading', { name: 'Map the columns' })).toBeVisible();
}

/** The van page shows times like showDateTime does: en-GB, Europe/London (Maren's settings). */
const shown = (iso: string) =>
	new Intl.DateTimeFormat('en-GB', {
		day: 'numeric',
		month: 'short',
		year: 'numeric',
		hour: '2-digit',
		minute: '2-digit',
		timeZone: 'Europe/London'
	}).format(new Date(iso));

async function openVan(page: Page) {
	await page.goto(`/fleet?q=${encodeURIComponent(VAN)}`);
	await page.getByRole('link', { name: VAN, exact: true }).first().click();
	await expect(page.getByRole('heading', { level: 1, name: VAN })).toBeVisible();
}

/** Rows of the van's readings table taken at `iso` with Δp `mbar`. */
const readingRows = (page: Page, iso: string, mbar: number) =>
	page
		.getByRole('table', { name: /readings/i })
		.getByRole('row')
		.filter({ hasText: shown(iso) })
		.filter({ hasText: `${mbar} mbar` });

test('a readings CSV with a bad line is refused with its line and column; the fixed file imports and can be undone', async ({
	page
}) => {
	await signIn(page, ACCOUNTS.fleetManager.email);

	const badTimes = [hoursAgo(9), hoursAgo(8), hoursAgo(7)];
	const bad = [
		'registration,taken_at,dp_mbar',
		`${VAN},${badTimes[0]},231`,
		`${VAN},${badTimes[1]},23x6`,
		`${VAN},${badTimes[2]},241`
	].join('\n');
	await uploadCsv(page, 'readings-bad.csv', bad);
	await page.getByRole('button', { name: 'Import all rows' }).click();
	const alert = page.getByRole('alert').filter({ hasText: 'Nothing was imported' });
	await expect(alert).toContainText(
		'Line 3, column 3 (dp_mbar): expected a number such as 123.4 for Δp, found “23x6”'
	);
	await openVan(page);
	await expect(page.getByRole('table', { name: /readings/i })).toBeVisible();
	await expect(readingRows(page, badTimes[0], 231)).toHaveCount(0);
	await expect(readingRows(page, badTimes[2], 241)).toHaveCount(0);

	const times = [hoursAgo(6), hoursAgo(5), hoursAgo(4)];
	const fixed = [
		'registration,taken_at,dp_mbar',
		`${VAN},${times[0]},231`,
		`${VAN},${times[1]},236`,
		`${VAN},${times[2]},241`
	].join('\n');
	await uploadCsv(page, 'readings-fixed.csv', fixed);
	await page.getByRole('button', { name: 'Check the first rows' }).click();
	await expect(page.getByRole('cell', { name: 'Ready' })).toHaveCount(3);
	await page.getByRole('button', { name: 'Import all rows' }).click();
	await expect(page).toHaveURL(/\/fleet\/imports\?imported=\d+/);
	await expect(page.getByRole('status')).toContainText(
		'Imported 3 Δp readings from readings-fixed.csv'
	);

	await page.getByRole('status').getByRole('link', { name: VAN }).click();
	await expect(page.getByRole('heading', { level: 1, name: VAN })).toBeVisible();
	await expect(readingRows(page, times[0], 231)).toHaveCount(1);
	await expect(readingRows(page, times[1], 236)).toHaveCount(1);
	await expect(readingRows(page, times[2], 241)).toHaveCount(1);

	await page.goto('/fleet/imports');
	await page.getByRole('button', { name: /Undo import \d+ \(readings-fixed\.csv\)/ }).click();
	await expect(page.getByRole('status')).toContainText('was undone');
	await expect(page.getByRole('cell', { name: 'Undone' })).toHaveCount(1);
	await openVan(page);
	await expect(page.getByRole('table', { name: /readings/i })).toBeVisible();
	for (const [i, mbar] of [231, 236, 241].entries())
		await expect(readingRows(page, times[i], mbar)).toHaveCount(0);
});
