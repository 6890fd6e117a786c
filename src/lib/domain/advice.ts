/**
 * Advice in plain sentences: to the driver about their own recent weeks, to the fleet manager
 * about how the van is used and when to book it in. Every item says what it rests on.
 */
import type { CrossingForecast } from './forecast';
import type { VanStatusResult } from './status';
import type { UsageSummary } from './usage';

export interface AdviceItem {
	audience: 'driver' | 'fleet_manager';
	text: string;
	/** The numbers the advice rests on. */
	restsOn: string;
}

export interface AdviceOptions {
	/** Regeneration-capable drives a week we ask for (default 2; Sootcast's own target). */
	regenDrivesPerWeekTarget?: number;
	/** Idle share above which we mention idling (default 0.2; Sootcast's own threshold). */
	idleShareToMention?: number;
	/** Short-trip share above which the duty cycle counts as short-trip work (default 0.6). */
	shortTripShareHigh?: number;
}

const ADVICE_DEFAULTS: Readonly<Required<AdviceOptions>> = Object.freeze({
	regenDrivesPerWeekTarget: 2,
	idleShareToMention: 0.2,
	shortTripShareHigh: 0.6
});

const WEEKDAYS = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'];

function percent(share: number): string {
	return `${Math.round(share * 100)} %`;
}

function plural(count: number, word: string): string {
	return `${count} ${word}${count === 1 ? '' : 's'}`;
}

/**
 * Advice to the driver about the last 7 days of the usage window (and the filter's recent
 * regenerations, when a forecast is given). Short, concrete, about their own week.
 */
export function adviseDriver(
	usage: UsageSummary,
	forecast: CrossingForecast | null = null,
	options: AdviceOptions = {}
): AdviceItem[] {
	const o = { ...ADVICE_DEFAULTS, ...options };
	const week = usage.weeks[usage.weeks.length - 1];
	const items: AdviceItem[] = [];
	const say = (text: string, restsOn: string) => items.push({ audience: 'driver', text, restsOn });
	const u = usage.options;
	const weekFacts = `last 7 days: ${plural(week.trips, 'trip')}, ${week.regenCapableDrives} of at least ${u.regenDriveMinutes} min moving at ${u.steadySpeedKmh}+ km/h, ${week.shortTrips} under ${u.shortTripMinutes} min or ${u.shortTripKm} km`;

	if (week.trips === 0) {
		say('No trips were logged for this van in the last 7 days.', weekFacts);
		return items;
	}
	const capable = week.regenCapableDrives;
	const enough = capable >= o.regenDrivesPerWeekTarget;
	const first = `${capable} of your ${week.trips} trips last week ${capable === 1 ? 'was' : 'were'} long enough for the filter to clean itself.`;
	if (enough) {
		say(`${first} That is enough — keep it up.`, weekFacts);
	} else {
		// Suggest the busiest day that had no such drive: the van is out anyway.
		let bestDay = -1;
		week.tripsByWeekday.forEach((trips, day) => {
			if (week.regenCapableByWeekday[day] > 0 || trips === 0) return;
			if (bestDay < 0 || trips > week.tripsByWeekday[bestDay]) bestDay = day;
		});
		const when = bestDay >= 0 ? ` on ${WEEKDAYS[bestDay]}` : '';
		const minutes = u.regenDriveMinutes + 5;
		say(
			`${first} One ${minutes}-minute run at steady speed${when} would help.`,
			`${weekFacts}; target ${o.regenDrivesPerWeekTarget} a week`
		);
	}
	if (week.shortTrips / week.trips >= o.shortTripShareHigh) {
		say(
			`${week.shortTrips} of your ${week.trips} trips were short hops. Joining them into one round where the route allows means fewer cold starts.`,
			`${percent(week.shortTrips / week.trips)} short trips last week (under ${u.shortTripMinutes} min or ${u.shortTripKm} km)`
		);
	}
	if (usage.idleShare !== null && usage.idleShare >= o.idleShareToMention) {
		const hours = usage.idleMinutes / 60;
		say(
			`The engine idled ${hours.toFixed(1)} hours over the last ${usage.windowDays} days, ${percent(usage.idleShare)} of driving time. Switching off during long stops means less soot.`,
			`idle ${Math.round(usage.idleMinutes)} min of ${Math.round((usage.meanTripMinutes ?? 0) * usage.trips)} min`
		);
	}
	const interrupted = forecast?.regenerations.interruptedInCurrentCycle ?? 0;
	if (interrupted > 0) {
		say(
			`The filter started cleaning itself ${interrupted === 1 ? 'once' : `${interrupted} times`} and was stopped before it finished. When the dashboard shows it is cleaning, keep driving at a steady speed until it is done.`,
			`${plural(interrupted, 'interrupted regeneration')} reported since the last completed one`
		);
	}
	if (forecast?.state === 'over_line') {
		say(
			'The filter is past its limit. Your fleet manager will arrange a workshop check; until then, avoid long idling.',
			`last comparable reading ${forecast.series.lastReadingMbar?.toFixed(0)} mbar, line ${forecast.series.concernMbar} mbar`
		);
	}
	return items;
}

/**
 * Advice to the fleet manager: structural changes (routes, rotation, briefings) and when to
 * book the van in.
 * @param vanName how the van is called in the sentences (e.g. its registration)
 */
export function adviseFleetManager(
	vanName: string,
	usage: UsageSummary | null,
	forecast: CrossingForecast,
	status: VanStatusResult,
	options: AdviceOptions = {}
): AdviceItem[] {
	const o = { ...ADVICE_DEFAULTS, ...options };
	const items: AdviceItem[] = [];
	const say = (text: string, restsOn: string) =>
		items.push({ audience: 'fleet_manager', text, restsOn });
	const day = (at: Date) => at.toISOString().slice(0, 10);

	switch (status.status) {
		case 'over_line':
			say(
				`Book ${vanName} in now: its filter is at or above the concern line.`,
				forecast.confidence.reason
			);
			break;
		case 'crossing_soon':
		case 'watch': {
			const by = forecast.crossing.earliest ?? forecast.crossing.expected;
			if (by) {
				say(
					`Book ${vanName} in before ${day(by)}, the earliest likely date it reaches ${forecast.series.concernMbar} mbar.`,
					forecast.explanation
				);
			}
			break;
		}
		case 'check_sensor':
			say(
				`Have the differential-pressure sensor and its pipes on ${vanName} checked: the readings are too low to trust, and a blocked filter can hide behind them.`,
				forecast.explanation
			);
			break;
		case 'insufficient_data':
			say(
				`Take a road-load reading on ${vanName} every week for the next six weeks to get a forecast.`,
				forecast.explanation
			);
			break;
		default:
			break;
	}
	if (usage && usage.trips > 0 && usage.shortTripShare !== null) {
		const u = usage.options;
		const facts = `${percent(usage.shortTripShare)} of ${usage.trips} trips in ${usage.windowDays} days were short (under ${u.shortTripMinutes} min or ${u.shortTripKm} km); ${usage.regenCapablePerWeek.toFixed(1)} regeneration-capable drives a week`;
		if (
			usage.shortTripShare >= o.shortTripShareHigh &&
			usage.regenCapablePerWeek < o.regenDrivesPerWeekTarget
		) {
			say(
				`Rotate ${vanName} onto a route with longer runs for a week in three, or swap it with a van on a motorway round: its work is mostly short hops.`,
				facts
			);
		} else if (usage.regenCapablePerWeek < o.regenDrivesPerWeekTarget) {
			say(
				`Plan one steady ${u.regenDriveMinutes + 10}-minute run a week into ${vanName}'s round.`,
				facts
			);
		}
	}
	if (forecast.regenerations.interruptedInCurrentCycle >= 3) {
		say(
			`Brief ${vanName}'s driver on letting a regeneration finish: ${forecast.regenerations.interruptedInCurrentCycle} have been cut short since the last one completed.`,
			`${forecast.regenerations.interruptedInCurrentCycle} interrupted regenerations reported in the current cycle`
		);
	}
	return items;
}
