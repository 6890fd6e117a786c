import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import { beforeAll, describe, expect, inject, it } from 'vitest';
import { readMailbox, recipients } from './mail';

let db: typeof import('../../src/lib/server/db');
let outbox: typeof import('../../src/lib/server/services/outbox');
let mailer: typeof import('../../src/lib/server/mail/mailer');
let sinkModule: typeof import('../../src/lib/server/mail/sink');
let lease: typeof import('../../src/lib/server/services/job-runner');

beforeAll(async () => {
	process.env.DATABASE_URL = inject('databaseUrl');
	db = await import('../../src/lib/server/db');
	db.getDb();
	outbox = await import('../../src/lib/server/services/outbox');
	mailer = await import('../../src/lib/server/mail/mailer');
	sinkModule = await import('../../src/lib/server/mail/sink');
	lease = await import('../../src/lib/server/services/job-runner');
});

function freePort(): Promise<number> {
	return new Promise((resolve) => {
		const s = net.createServer().listen(0, '127.0.0.1', () => {
			const { port } = s.address() as net.AddressInfo;
			s.close(() => resolve(port));
		});
	});
}

describe('the outbox', () => {
	it('keeps messages while the mail server is down and sends each exactly once when it is back', async () => {
		const port = await freePort();
		const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sootcast-outbox-'));
		mailer.configureMailTransport(`smtp://127.0.0.1:${port}`);
		const t0 = new Date();
		const keys = ['a', 'b', 'c'].map((k) => `outbox-test:${t0.getTime()}:${k}`);
		for (const key of keys) {
			expect(
				await outbox.queueMail(
					{
						recipient: `${key.slice(-1)}@outbox.test`,
						subject: 'Sink test',
						text: 'hello',
						dedupeKey: key
					},
					t0
				)
			).toBe(true);
		}
		// Queuing the same key again adds nothing.
		expect(
			await outbox.queueMail(
				{ recipient: 'a@outbox.test', subject: 'Sink test', text: 'hello', dedupeKey: keys[0] },
				t0
			)
		).toBe(false);

		const down = await outbox.deliverDueMail(t0);
		expect(down.sent).toBe(0);
		expect(down.retrying).toBeGreaterThanOrEqual(3);
		const pending = await db.OutboxMessage.findAll({ where: { dedupeKey: keys } });
		expect(pending.every((m) => m.state === 'pending' && m.attempts === 1 && m.lastError)).toBe(
			true
		);

		// Before the back-off has passed nothing is retried.
		expect((await outbox.deliverDueMail(new Date(t0.getTime() + 10_000))).sent).toBe(0);

		const sink = await sinkModule.startMailSink({ port, dir });
		try {
			const later = new Date(t0.getTime() + outbox.retryDelayMs(1) + 1_000);
			const up = await outbox.deliverDueMail(later);
			expect(up.sent).toBeGreaterThanOrEqual(3);
			expect((await outbox.deliverDueMail(new Date(later.getTime() + 3_600_000))).sent).toBe(0);
			const received = (await readMailbox(dir)).filter((m) => m.subject === 'Sink test');
			expect(received.map((m) => recipients(m)[0]).sort()).toEqual([
				'a@outbox.test',
				'b@outbox.test',
				'c@outbox.test'
			]);
		} finally {
			await sink.close();
			mailer.configureMailTransport(inject('smtpUrl'));
		}
	});
});

describe('job leases', () => {
	it('two runs started at the same moment do the work once', async () => {
		let worked = 0;
		const work = async () => {
			worked++;
			await new Promise((r) => setTimeout(r, 200));
			return { done: 1 };
		};
		const [a, b] = await Promise.all([
			lease.runUnderLease('lease-test', work),
			lease.runUnderLease('lease-test', work)
		]);
		expect(worked).toBe(1);
		expect([a.skipped, b.skipped].sort()).toEqual([false, true]);
		// Once released, the next run goes ahead.
		expect((await lease.runUnderLease('lease-test', work)).skipped).toBe(false);
	});

	it('takes over a lease whose holder died (expired)', async () => {
		const { acquireLease } = await import('../../src/lib/server/services/job-lease');
		const now = new Date();
		expect(await acquireLease('dead-holder', 'crashed-process', 1_000, now)).toBe(true);
		expect(await acquireLease('dead-holder', 'someone-else', 1_000, now)).toBe(false);
		expect(
			await acquireLease('dead-holder', 'someone-else', 1_000, new Date(now.getTime() + 5_000))
		).toBe(true);
	});
});
