import fs from 'node:fs/promises';
import path from 'node:path';
import { simpleParser } from 'mailparser';
import { config } from '../config';

/** The development mailbox exists only while `npm start`'s local sink is the transport. */
export function devMailboxDir(): string | null {
	return config.DEV_MAILBOX_DIR ? path.resolve(config.DEV_MAILBOX_DIR) : null;
}

export interface MailboxEntry {
	id: string;
	date: string | null;
	to: string;
	subject: string;
	text: string;
	attachments: { filename: string; contentType: string; size: number }[];
}

const SAFE_ID = /^[\w.-]+\.eml$/;

async function readEntry(dir: string, id: string): Promise<MailboxEntry> {
	const parsed = await simpleParser(await fs.readFile(path.join(dir, id)));
	const to = Array.isArray(parsed.to)
		? parsed.to.map((a) => a.text).join(', ')
		: (parsed.to?.text ?? '');
	return {
		id,
		date: parsed.date?.toISOString() ?? null,
		to,
		subject: parsed.subject ?? '(no subject)',
		text: parsed.text ?? '',
		attachments: parsed.attachments.map((a) => ({
			filename: a.filename ?? 'attachment',
			contentType: a.contentType,
			size: a.size
		}))
	};
}

/** The newest messages first. */
export async function listDevMailbox(limit = 50): Promise<MailboxEntry[] | null> {
	const dir = devMailboxDir();
	if (!dir) return null;
	const names = (await fs.readdir(dir).catch(() => [] as string[]))
		.filter((n) => SAFE_ID.test(n))
		.sort()
		.reverse()
		.slice(0, limit);
	return Promise.all(names.map((n) => readEntry(dir, n)));
}
