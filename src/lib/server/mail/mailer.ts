import nodemailer, { type Transporter, type TransportOptions } from 'nodemailer';
import { config } from '../config';

export interface OutgoingMail {
	to: string;
	subject: string;
	text: string;
	html?: string | null;
	/** Stable per message, so a receiving server can drop a duplicate. */
	messageId?: string;
	headers?: Record<string, string>;
	attachments?: { filename: string; content: string; contentType: string }[];
}

let transport: Transporter | null = null;
let transportUrl: string | undefined = config.SMTP_URL;

/** Points the mailer at an SMTP server (`npm start` calls this with the local sink's URL). */
export function configureMailTransport(url: string): void {
	transportUrl = url;
	transport?.close();
	transport = null;
}

export function mailTransportUrl(): string | undefined {
	return transportUrl;
}

function getTransport(): Transporter {
	if (transport) return transport;
	if (!transportUrl) throw new Error('No mail server is configured: set SMTP_URL.');
	const url = new URL(transportUrl);
	const loopback = ['127.0.0.1', 'localhost', '[::1]'].includes(url.hostname);
	transport = nodemailer.createTransport({
		url: transportUrl,
		// The local sink speaks plain SMTP on loopback; real servers keep STARTTLS.
		ignoreTLS: loopback,
		connectionTimeout: 10_000,
		greetingTimeout: 10_000,
		socketTimeout: 20_000
	} as TransportOptions);
	return transport;
}

export async function sendMail(mail: OutgoingMail): Promise<void> {
	// nodemailer writes List-* headers itself from `list`; passed as plain headers they are dropped.
	const { 'List-Unsubscribe': unsubscribe, ...headers } = mail.headers ?? {};
	await getTransport().sendMail({
		from: config.MAIL_FROM,
		to: mail.to,
		subject: mail.subject,
		text: mail.text,
		html: mail.html ?? undefined,
		messageId: mail.messageId,
		headers,
		list: unsubscribe ? { unsubscribe: unsubscribe.replace(/^<|>$/g, '') } : undefined,
		attachments: mail.attachments
	});
}
