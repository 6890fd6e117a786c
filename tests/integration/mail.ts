import fs from 'node:fs';
import path from 'node:path';
import { simpleParser, type ParsedMail } from 'mailparser';

/** Every message in the sink's folder, parsed. */
export async function readMailbox(dir: string): Promise<(ParsedMail & { file: string })[]> {
	if (!fs.existsSync(dir)) return [];
	const files = fs
		.readdirSync(dir)
		.filter((f) => f.endsWith('.eml'))
		.sort();
	return Promise.all(
		files.map(async (file) =>
			Object.assign(await simpleParser(fs.readFileSync(path.join(dir, file))), { file })
		)
	);
}

export const recipients = (m: ParsedMail) =>
	(Array.isArray(m.to) ? m.to : m.to ? [m.to] : []).flatMap((a) =>
		a.value.map((v) => v.address ?? '')
	);

/** Waits (bounded) until a message for `to` whose subject matches arrives, and returns it. */
export async function waitForMail(
	dir: string,
	to: string,
	subject: RegExp,
	timeoutMs = 10_000
): Promise<ParsedMail> {
	const until = Date.now() + timeoutMs;
	while (Date.now() < until) {
		const found = (await readMailbox(dir)).find(
			(m) => recipients(m).includes(to) && subject.test(m.subject ?? '')
		);
		if (found) return found;
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new Error(`No message to ${to} matching ${subject} arrived within ${timeoutMs} ms.`);
}

export function firstLink(text: string, pathPrefix: string): string {
	const match = new RegExp(`https?://[^\\s]+${pathPrefix}[^\\s]+`).exec(text);
	if (!match) throw new Error(`No ${pathPrefix} link in the message.`);
	return match[0];
}
