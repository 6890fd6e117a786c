import { expect, type Page } from '@playwright/test';
import AxeBuilder from '@axe-core/playwright';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../src/lib/server/demo/scenario';

export const ACCOUNTS = DEMO_ACCOUNTS;

/** Opens a page and waits until it is interactive (hydrated), so typing is not lost. */
export async function open(page: Page, path: string) {
	await page.goto(path);
	await page.locator('html[data-ready="true"]').waitFor();
}

/** Signs in through the real form, by label, as a person would. */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
	await open(page, '/login');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page).not.toHaveURL(/\/login/);
}

/** No serious or critical accessibility violations on the page as it is now. */
export async function expectAccessible(page: Page) {
	const results = await new AxeBuilder({ page }).analyze();
	const bad = results.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
	expect(
		bad.map((v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join('; ')})`)
	).toEqual([]);
}
