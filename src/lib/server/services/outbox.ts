import { Op, UniqueConstraintError } from 'sequelize';
import { OutboxMessage } from '../db';
import { sendMail } from '../mail/mailer';

export interface QueuedMail {
	recipient: string;
	subject: string;
	text: string;
	html?: string | null;
	/** Same key, same message: queuing it again is a no-op, so reruns never re-send. */
	dedupeKey: string;
	attachments?: { filename: string; content: string; contentType: string }[] | null;
	headers?: Record<string, string>;
}

/** Minutes to wait after the n-th failed attempt; the last entry repeats. */
const BACKOFF_MINUTES = [1, 5, 15, 60, 240];
export const MAX_ATTEMPTS = 10;

export function retryDelayMs(attempts: number): number {
	return BACKOFF_MINUTES[Math.min(attempts, BACKOFF_MINUTES.length) - 1] * 60_000;
}

/** Adds a message to the outbox unless one with the same dedupe key exists. Returns true if added. */
export async function queueMail(mail: QueuedMail, now = new Date()): Promise<boolean> {
	try {
		await OutboxMessage.create({
			recipient: mail.recipient,
			subject: mail.subject,
			textBody: mail.text,
			htmlBody: mail.html ?? null,
			attachments: { files: mail.attachments ?? [], headers: mail.headers ?? {} },
			dedupeKey: mail.dedupeKey,
			nextAttemptAt: now
		});
		return true;
	} catch (err) {
		if (err instanceof UniqueConstraintError) return false;
		throw err;
	}
}

export interface DeliverySummary {
	sent: number;
	retrying: number;
	failed: number;
}

/**
 * Sends the messages that are due. Each is claimed with a conditional update first, so two
 * workers never send the same message; a failure schedules a retry with back-off, and after
 * MAX_ATTEMPTS the message is parked as failed for an administrator to look at.
 */
export async function deliverDueMail(now = new Date(), limit = 100): Promise<DeliverySummary> {
	const summary: DeliverySummary = { sent: 0, retrying: 0, failed: 0 };
	const due = await OutboxMessage.findAll({
		where: { state: 'pending', nextAttemptAt: { [Op.lte]: now } },
		order: [['id', 'ASC']],
		limit
	});
	for (const message of due) {
		const claimUntil = new Date(now.getTime() + 10 * 60_000);
		const [claimed] = await OutboxMessage.update(
			{ nextAttemptAt: claimUntil, attempts: message.attempts + 1 },
			{ where: { id: message.id, state: 'pending', attempts: message.attempts } }
		);
		if (claimed !== 1) continue; // another worker has it
		const extra = (message.attachments ?? {}) as {
			files?: QueuedMail['attachments'];
			headers?: Record<string, string>;
		};
		try {
			await sendMail({
				to: message.recipient,
				subject: message.subject,
				text: message.textBody,
				html: message.htmlBody,
				messageId: `<${message.dedupeKey.replace(/[^A-Za-z0-9.-]/g, '.')}@sootcast>`,
				headers: extra.headers,
				attachments: extra.files ?? undefined
			});
			await OutboxMessage.update(
				{ state: 'sent', sentAt: new Date(), lastError: null },
				{ where: { id: message.id } }
			);
			summary.sent++;
		} catch (err) {
			const attempts = message.attempts + 1;
			const failed = attempts >= MAX_ATTEMPTS;
			await OutboxMessage.update(
				{
					state: failed ? 'failed' : 'pending',
					lastError: err instanceof Error ? err.message.slice(0, 1000) : String(err),
					nextAttemptAt: failed ? null : new Date(now.getTime() + retryDelayMs(attempts))
				},
				{ where: { id: message.id } }
			);
			if (failed) summary.failed++;
			else summary.retrying++;
		}
	}
	return summary;
}

/**
 * Tries to send what is due right away, without waiting for the outbox job; anything that
 * fails stays queued for the job's retries. For mail a person is waiting for (invitations,
 * password resets, booking changes).
 */
export function kickOutbox(): void {
	deliverDueMail().catch((err) =>
		console.error('[outbox] immediate delivery failed; the outbox job will retry', err)
	);
}
