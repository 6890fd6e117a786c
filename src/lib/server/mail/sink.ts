import fs from 'node:fs/promises';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import { SMTPServer } from 'smtp-server';

/**
 * A real SMTP server on loopback that keeps every message it receives as an .eml file.
 * Development, tests and the demo send through it with the same code path as production.
 */
export interface MailSink {
	port: number;
	dir: string;
	close(): Promise<void>;
}

export async function startMailSink(options: {
	port: number;
	dir: string;
	host?: string;
}): Promise<MailSink> {
	await fs.mkdir(options.dir, { recursive: true });
	const server = new SMTPServer({
		authOptional: true,
		disabledCommands: ['STARTTLS'],
		logger: false,
		size: 25 * 1024 * 1024,
		onData(stream, _session, callback) {
			const chunks: Buffer[] = [];
			stream.on('data', (c: Buffer) => chunks.push(c));
			stream.on('error', callback);
			stream.on('end', async () => {
				try {
					const name = `${new Date().toISOString().replace(/[:.]/g, '-')}-${randomUUID().slice(0, 8)}.eml`;
					// Write then rename, so a reader never sees half a message.
					const tmp = path.join(options.dir, `.${name}.tmp`);
					await fs.writeFile(tmp, Buffer.concat(chunks));
					await fs.rename(tmp, path.join(options.dir, name));
					callback();
				} catch (err) {
					callback(err as Error);
				}
			});
		}
	});
	const host = options.host ?? '127.0.0.1';
	await new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(options.port, host, () => resolve());
	});
	const address = server.server.address();
	const port = typeof address === 'object' && address ? address.port : options.port;
	return {
		port,
		dir: options.dir,
		close: () => new Promise<void>((resolve) => server.close(() => resolve()))
	};
}
