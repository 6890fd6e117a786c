import { expect, test } from '@playwright/test';
import { ACCOUNTS, signIn } from './helpers';
import { generateStaticTestCapture } from '../../src/lib/domain/capture/synthetic';

/** The healthy synthetic static test (20 s at 2 kHz) as a scope-style CSV. */
function captureCsv(): Buffer {
	const { timesS, volts } = generateStaticTestCapture();
	const lines = ['Time (ms),Channel A (V)'];
	for (let i = 0; i < timesS.length; i++)
		lines.push(`${(timesS[i] * 1000).toFixed(3)},${volts[i].toFixed(5)}`);
	return Buffer.from(lines.join('\n') + '\n');
}

test('a workshop uploads a capture, reads the verdicts, zooms the chart and adjusts a phase', async ({
	page
}) => {
	await signIn(page, ACCOUNTS.workshop.email);
	await page.goto('/workshop?q=LKD%20430');
	await page.getByRole('link', { name: 'LKD 430', exact: true }).first().click();
	await page.getByRole('link', { name: 'Record a test' }).click();
	await expect(page.getByRole('heading', { name: 'Safety first' })).toBeVisible();

	await page
		.getByLabel('Capture file (CSV of time and volts)')
		.setInputFiles({ name: 'blip.csv', mimeType: 'text/csv', buffer: captureCsv() });
	await page.getByRole('button', { name: 'Upload and analyse' }).click();
	await expect(
		page.getByRole('heading', { level: 1, name: /Static test on LKD 430/ })
	).toBeVisible();
	await expect(page.getByRole('heading', { name: 'Safety first' })).toBeVisible();
	await expect(page.getByText('Pipes to the sensor')).toBeVisible();

	const status = page.getByText(/^Showing /);
	await expect(status).toContainText('Showing 0.00–20.00 s');
	await page.getByRole('button', { name: 'Zoom in' }).click();
	await page.getByRole('button', { name: 'Zoom in' }).click();
	await expect(status).toContainText('Showing 7.50–12.50 s');
	await page.getByRole('button', { name: 'Idle', exact: true }).click();
	await expect(status).not.toContainText('Showing 7.50–12.50 s');

	await page.getByLabel('Throttle (stationary) end in seconds').fill('');
	await page.getByLabel('Throttle (stationary) start in seconds').fill('');
	await page.getByRole('button', { name: 'Judge with these phases' }).click();
	await expect(page.getByText('Judged again with the phases below.')).toBeVisible();
	await expect(page.getByText('Set by the technician.')).toBeVisible();
});
