import fs from 'node:fs';
import path from 'node:path';
import { expect, test, type Page } from '@playwright/test';
import { simpleParser } from 'mailparser';
import { ACCOUNTS, open, signIn } from './helpers';

// The launcher's local sink keeps messages here (see playwright.config.ts).
const mailDir = path.join(process.env.SOOTCAST_E2E_DIR ?? '', 'mailbox');

async function linkFromMail(to: string, subject: RegExp, pathPrefix: string): Promise<string> {
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
			if (addresses.includes(to) && subject.test(mail.subject ?? '')) {
				const match = new RegExp(`https?://\\S+${pathPrefix}\\S+`).exec(mail.text ?? '');
				if (match) return new URL(match[0]).pathname;
			}
		}
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error(`No message to ${to} arrived in the local sink.`);
}

async function choosePassword(page: Page, password: string, button: string) {
	await page.getByLabel('New password').fill(password);
	await page.getByLabel('Type it again').fill(password);
	await page.getByRole('button', { name: button }).click();
	await expect(page.getByRole('status')).toContainText('Your password is set');
}

test('an admin invites a workshop user, who sets a password from the e-mail and signs in', async ({
	page
}) => {
	const email = 'kit.marlowe@fenwright.test';
	await signIn(page, ACCOUNTS.admin.email);
	await page.getByRole('link', { name: 'Invite' }).click();
	await page.getByLabel('Name').fill('Kit Marlowe');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Role').selectOption('workshop');
	await page.getByLabel('Organisation').selectOption({ label: 'Fenwright Diesel Clinic' });
	await page.getByRole('button', { name: 'Send the invitation' }).click();
	await expect(page.getByRole('status')).toContainText(`Invitation sent to ${email}`);

	// The message is in the development mailbox too.
	await page.getByRole('link', { name: 'Mailbox' }).click();
	await expect(page.getByText('Rowan Achterberg invited you to Sootcast').first()).toBeVisible();
	await page.getByRole('button', { name: 'Sign out' }).click();

	await open(page, await linkFromMail(email, /invited you to Sootcast/, '/welcome/'));
	await expect(page.getByRole('heading', { name: 'Welcome to Sootcast' })).toBeVisible();
	await choosePassword(page, 'kit-chooses-a-password', 'Set my password');
	await signIn(page, email, 'kit-chooses-a-password');
	await expect(page).toHaveURL(/\/workshop$/);
});

test('a driver resets a forgotten password from the e-mailed link', async ({ page }) => {
	const email = 'wren.halloway@larkspur.test';
	await open(page, '/login');
	await page.getByRole('link', { name: 'Forgotten your password?' }).click();
	// Wait for the new page: the sign-in page also has an "E-mail" field.
	await expect(page.getByRole('heading', { name: 'Forgotten password' })).toBeVisible();
	await page.getByLabel('E-mail').fill(email);
	await page.getByRole('button', { name: 'Send the link' }).click();
	await expect(page.getByRole('status')).toContainText(
		'a link to choose a new password is on its way'
	);

	await open(page, await linkFromMail(email, /Reset your Sootcast password/, '/reset/'));
	await choosePassword(page, 'wren-new-password-2026', 'Save the new password');
	await signIn(page, email, 'wren-new-password-2026');
	await expect(page).toHaveURL(/\/driver$/);
});
