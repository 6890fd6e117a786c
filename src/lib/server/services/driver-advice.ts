import { createHmac, timingSafeEqual } from 'node:crypto';
import { Op } from 'sequelize';
import { forecastCrossing } from '../../domain/forecast';
import { adviseDriver, type AdviceItem } from '../../domain/advice';
import { summariseUsage, type UsageSummary } from '../../domain/usage';
import { publicUrl } from '../config';
import { appSecret } from '../secret';
import { Trip, User, Vehicle } from '../db';
import { buttonHtml, escapeHtml, frameHtml } from '../mail/html';
import { loadEngineInput } from './forecasts';
import { queueMail } from './outbox';
import { recordAudit } from './audit';

const DAY_MS = 86_400_000;

export interface VanAdvice {
	vehicleId: number;
	registration: string;
	usage: UsageSummary;
	items: AdviceItem[];
}

/** This week's advice for one van from its own trips and its current forecast. */
export async function adviceForVan(
	vehicleId: number,
	registration: string,
	now: Date
): Promise<VanAdvice> {
	const since = new Date(now.getTime() - 28 * DAY_MS);
	const trips = await Trip.findAll({
		where: { vehicleId, startedAt: { [Op.gte]: since, [Op.lte]: now } },
		order: [['startedAt', 'ASC']],
		raw: true
	});
	const usage = summariseUsage(
		trips.map((t) => ({
			start: new Date(t.startedAt),
			end: new Date(t.endedAt),
			distanceKm: t.distanceKm,
			idleMinutes: t.idleMinutes,
			meanSpeedKmh: t.meanSpeedKmh ?? 0
		})),
		now
	);
	const { readings, events } = await loadEngineInput(vehicleId);
	const forecast = readings.length ? forecastCrossing({ readings, events, now }) : null;
	return { vehicleId, registration, usage, items: adviseDriver(usage, forecast) };
}

/** Advice for every van assigned to this driver. */
export async function adviceForDriver(driverId: number, now: Date): Promise<VanAdvice[]> {
	const vans = await Vehicle.findAll({
		where: { driverId, archivedAt: null },
		order: [['registration', 'ASC']],
		raw: true
	});
	return Promise.all(vans.map((v) => adviceForVan(v.id, v.registration, now)));
}

// ─── Signed unsubscribe links ───────────────────────────────────────────────────────────

const sign = (userId: number) =>
	createHmac('sha256', appSecret())
		.update(`advice-unsubscribe:${userId}`)
		.digest('base64url')
		.slice(0, 32);

export function unsubscribeToken(userId: number): string {
	return `${userId}.${sign(userId)}`;
}

/** The user id a token was signed for, or null for anything forged or malformed. */
export function verifyUnsubscribeToken(token: string): number | null {
	const match = /^(\d{1,10})\.([\w-]{32})$/.exec(token);
	if (!match) return null;
	const userId = Number(match[1]);
	const expected = Buffer.from(sign(userId));
	const given = Buffer.from(match[2]);
	return expected.length === given.length && timingSafeEqual(expected, given) ? userId : null;
}

/** Stops the weekly advice for the person the (already verified) token names. */
export async function unsubscribeFromAdvice(token: string, now = new Date()): Promise<boolean> {
	const userId = verifyUnsubscribeToken(token);
	if (userId === null) return false;
	const [changed] = await User.update({ adviceOptOut: true }, { where: { id: userId } });
	if (changed) await recordAudit(null, 'user.advice_unsubscribe', 'user', userId, null, now);
	return changed === 1;
}

/** ISO 8601 week label (e.g. 2026-W49), so each driver gets one message a week at most. */
export function isoWeek(date: Date): string {
	const d = new Date(Date.UTC(date.getUTCFullYear(), date.getUTCMonth(), date.getUTCDate()));
	const day = d.getUTCDay() || 7;
	d.setUTCDate(d.getUTCDate() + 4 - day);
	const yearStart = Date.UTC(d.getUTCFullYear(), 0, 1);
	const week = Math.ceil(((d.getTime() - yearStart) / DAY_MS + 1) / 7);
	return `${d.getUTCFullYear()}-W${String(week).padStart(2, '0')}`;
}

/**
 * The weekly advice: one message per driver (all their vans), to those who have not opted
 * out. The dedupe key is the driver and the ISO week, so a rerun sends nothing twice.
 */
export async function queueWeeklyAdvice(
	now: Date
): Promise<{ drivers: number; queued: number; skippedNoTrips: number }> {
	const drivers = await User.findAll({
		where: { role: 'driver', active: true, adviceOptOut: false, passwordHash: { [Op.ne]: null } }
	});
	let queued = 0;
	let skippedNoTrips = 0;
	const week = isoWeek(now);
	for (const driver of drivers) {
		const vans = (await adviceForDriver(driver.id, now)).filter((v) => v.usage.trips > 0);
		if (!vans.length) {
			skippedNoTrips++;
			continue;
		}
		const link = `${publicUrl()}/unsubscribe/${unsubscribeToken(driver.id)}`;
		const text = `Hello ${driver.name},\n\n${vans
			.map((v) => `${v.registration}\n${v.items.map((i) => `- ${i.text}`).join('\n')}`)
			.join('\n\n')}\n\nStop these weekly notes: ${link}\n`;
		const html = frameHtml(
			'Your week and your van’s filter',
			`<p>Hello ${escapeHtml(driver.name)},</p>${vans
				.map(
					(v) =>
						`<h2 style="font-size:17px;margin:16px 0 6px">${escapeHtml(v.registration)}</h2><ul style="padding-left:20px;margin:0">${v.items
							.map(
								(i) =>
									`<li style="margin-bottom:8px">${escapeHtml(i.text)}<br><span style="font-size:13px;color:#4b5659">Based on: ${escapeHtml(i.restsOn)}</span></li>`
							)
							.join('')}</ul>`
				)
				.join('')}${buttonHtml(`${publicUrl()}/driver`, 'See it in Sootcast')}`,
			`One note a week from Sootcast. <a href="${escapeHtml(link)}" style="color:#2b5580">Stop these notes</a>.`
		);
		const added = await queueMail(
			{
				recipient: driver.email,
				subject: 'Your week and your van’s filter',
				text,
				html,
				dedupeKey: `advice:${driver.id}:${week}`,
				// Mail programs that show an unsubscribe button open the same signed page.
				headers: { 'List-Unsubscribe': `<${link}>` }
			},
			now
		);
		if (added) queued++;
	}
	return { drivers: drivers.length, queued, skippedNoTrips };
}
