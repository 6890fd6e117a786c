import fs from 'node:fs';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { config } from './config';

let cached: string | null = null;

/**
 * The key that signs links. From APP_SECRET when set (required with several instances);
 * otherwise generated once into data/app-secret so links survive a restart.
 */
export function appSecret(): string {
	if (cached) return cached;
	if (config.APP_SECRET) return (cached = config.APP_SECRET);
	const file = path.resolve('data', 'app-secret');
	try {
		cached = fs.readFileSync(file, 'utf8').trim();
	} catch {
		fs.mkdirSync(path.dirname(file), { recursive: true });
		const secret = randomBytes(32).toString('base64url');
		try {
			fs.writeFileSync(file, secret, { mode: 0o600, flag: 'wx' });
		} catch {
			// Another process wrote it first: use theirs.
		}
		cached = fs.readFileSync(file, 'utf8').trim();
	}
	return cached;
}
