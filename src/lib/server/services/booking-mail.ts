import { Op } from 'sequelize';
import { Booking, Organisation, User, Vehicle, WorkshopCapacity, together } from '../db';
import { publicUrl, config } from '../config';
import { buildInvitation } from '../mail/ical';
import { buttonHtml, escapeHtml, frameHtml } from '../mail/html';
import { showDateTime } from '../../format';
import { VISIT_KIND_LABEL, type VisitKind } from '../../domain/visits';
import { VISIT_CAUTIONS } from '../../visit-cautions';
import { kickOutbox, queueMail } from './outbox';

const CAUTIONS = `Safety: ${VISIT_CAUTIONS}`;

const HEADLINE: Record<string, (reg: string) => string> = {
	requested: (r) => `Visit requested for ${r}`,
	proposed: (r) => `New time proposed for ${r}'s visit`,
	confirmed: (r) => `Visit confirmed for ${r}`,
	declined: (r) => `Visit declined for ${r}`,
	cancelled: (r) => `Visit cancelled for ${r}`
};

const mailAddress = (from: string) => /<([^>]+)>/.exec(from)?.[1] ?? from;

/**
 * E-mails both sides (the fleet's managers, the workshop's people) about the booking's current
 * state, with an RFC 5545 invitation: METHOD:REQUEST while the visit stands, METHOD:CANCEL
 * once declined or cancelled. The dedupe key carries the SEQUENCE, so each change mails once.
 */
export async function sendBookingMail(bookingId: number, now: Date): Promise<void> {
	const b = await Booking.findByPk(bookingId);
	if (!b || !b.startsAt || !b.endsAt) return;
	const [vehicle, workshop, cap] = await together(
		() => Vehicle.findByPk(b.vehicleId),
		() => Organisation.findByPk(b.workshopId),
		() => WorkshopCapacity.findByPk(b.workshopId)
	);
	if (!vehicle || !workshop) return;
	const people = await User.findAll({
		where: {
			active: true,
			[Op.or]: [
				{ organisationId: vehicle.organisationId, role: 'fleet_manager' },
				{ organisationId: workshop.id, role: 'workshop' }
			]
		},
		order: [['id', 'ASC']]
	});
	const cancelled = b.state === 'cancelled' || b.state === 'declined';
	const kind = VISIT_KIND_LABEL[b.visitKind as VisitKind] ?? b.visitKind;
	const ics = buildInvitation({
		uid: b.uid,
		sequence: b.sequence,
		method: cancelled ? 'CANCEL' : 'REQUEST',
		status: cancelled ? 'CANCELLED' : b.state === 'confirmed' ? 'CONFIRMED' : 'TENTATIVE',
		startsAt: b.startsAt,
		endsAt: b.endsAt,
		stamp: now,
		summary: `${kind}: ${vehicle.registration} at ${workshop.name}`,
		location: workshop.name,
		description: `${kind} for ${vehicle.registration}.${b.reason ? `\nReason: ${b.reason}` : ''}\n\n${CAUTIONS}`,
		organizer: { name: workshop.name, email: mailAddress(config.MAIL_FROM) },
		attendees: people.map((p) => ({ name: p.name, email: p.email }))
	});
	const headline = (HEADLINE[b.state] ?? HEADLINE.requested)(vehicle.registration);
	for (const person of people) {
		const when = showDateTime(b.startsAt, person.locale, person.timeZone);
		const until = showDateTime(b.endsAt, person.locale, person.timeZone);
		const link = `${publicUrl()}/${person.role === 'workshop' ? 'workshop' : 'fleet'}/visits/${b.id}`;
		const lines = [
			`${kind} for ${vehicle.registration} at ${workshop.name}.`,
			`When: ${when} – ${until} (${person.timeZone}).`,
			`State: ${b.state}.`,
			b.reason ? `Reason given: ${b.reason}` : '',
			'',
			`Open the visit: ${link}`,
			'',
			CAUTIONS
		].filter((l, i, all) => l !== '' || all[i - 1] !== '');
		await queueMail(
			{
				recipient: person.email,
				subject: headline,
				text: lines.join('\n'),
				html: frameHtml(
					headline,
					`<p>${escapeHtml(`${kind} for ${vehicle.registration} at ${workshop.name}.`)}</p>` +
						`<p><strong>When:</strong> ${escapeHtml(`${when} – ${until} (${person.timeZone})`)}<br><strong>State:</strong> ${escapeHtml(b.state)}</p>` +
						(b.reason ? `<p><strong>Reason given:</strong> ${escapeHtml(b.reason)}</p>` : '') +
						buttonHtml(link, 'Open the visit') +
						`<p style="font-size:14px">${escapeHtml(CAUTIONS)}</p>`
				),
				dedupeKey: `booking:${b.uid}:${b.sequence}:${person.id}`,
				attachments: [
					{
						filename: 'visit.ics',
						content: ics,
						contentType: `text/calendar; charset=utf-8; method=${cancelled ? 'CANCEL' : 'REQUEST'}`
					}
				]
			},
			now
		);
	}
	kickOutbox();
}
