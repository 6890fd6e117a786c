/**
 * iCalendar (RFC 5545) invitations for preventive visits, with the iTIP methods of RFC 5546.
 * Times are written in UTC (RFC 5545 §3.3.5, form 2: "date with UTC time"), so no VTIMEZONE is
 * needed and every calendar shows the visit at the right instant in its own zone.
 */
export interface VisitInvitation {
	uid: string;
	sequence: number;
	method: 'REQUEST' | 'CANCEL';
	status: 'TENTATIVE' | 'CONFIRMED' | 'CANCELLED';
	startsAt: Date;
	endsAt: Date;
	stamp: Date;
	summary: string;
	description: string;
	location: string;
	organizer: { name: string; email: string };
	attendees: { name: string; email: string }[];
}

/** 19970714T173000Z — RFC 5545 §3.3.5. */
export function icalUtc(d: Date): string {
	return d
		.toISOString()
		.replace(/[-:]/g, '')
		.replace(/\.\d{3}/, '');
}

/** TEXT escaping — RFC 5545 §3.3.11: backslash, semicolon, comma, newline. */
export function escapeText(value: string): string {
	return value
		.replace(/\\/g, '\\\\')
		.replace(/;/g, '\\;')
		.replace(/,/g, '\\,')
		.replace(/\r?\n/g, '\\n');
}

/** Parameter values with unsafe characters are quoted — RFC 5545 §3.2 (param-value). */
const paramValue = (v: string) => (/[";:,]/.test(v) ? `"${v.replace(/"/g, "'")}"` : v);

/** Lines longer than 75 octets are folded with CRLF + space — RFC 5545 §3.1. */
export function foldLine(line: string): string {
	const bytes = Buffer.from(line, 'utf8');
	if (bytes.length <= 75) return line;
	const parts: string[] = [];
	let current = '';
	let size = 0;
	const limit = () => (parts.length === 0 ? 75 : 74); // continuation lines begin with one space
	for (const ch of line) {
		const n = Buffer.byteLength(ch, 'utf8');
		if (size + n > limit()) {
			parts.push(current);
			current = '';
			size = 0;
		}
		current += ch;
		size += n;
	}
	parts.push(current);
	return parts.join('\r\n ');
}

export function buildInvitation(inv: VisitInvitation): string {
	const lines = [
		'BEGIN:VCALENDAR',
		'VERSION:2.0',
		'PRODID:-//Sootcast//Preventive visits//EN',
		'CALSCALE:GREGORIAN',
		`METHOD:${inv.method}`,
		'BEGIN:VEVENT',
		`UID:${inv.uid}`,
		`SEQUENCE:${inv.sequence}`,
		`DTSTAMP:${icalUtc(inv.stamp)}`,
		`DTSTART:${icalUtc(inv.startsAt)}`,
		`DTEND:${icalUtc(inv.endsAt)}`,
		`STATUS:${inv.status}`,
		`SUMMARY:${escapeText(inv.summary)}`,
		`LOCATION:${escapeText(inv.location)}`,
		`DESCRIPTION:${escapeText(inv.description)}`,
		`ORGANIZER;CN=${paramValue(inv.organizer.name)}:mailto:${inv.organizer.email}`,
		...inv.attendees.map(
			(a) => `ATTENDEE;CN=${paramValue(a.name)};ROLE=REQ-PARTICIPANT:mailto:${a.email}`
		),
		'END:VEVENT',
		'END:VCALENDAR'
	];
	return lines.map(foldLine).join('\r\n') + '\r\n';
}
