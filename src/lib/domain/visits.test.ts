import { describe, expect, it } from 'vitest';
import { minutesOfDay, suggestedVisitWindow } from './visits';

// The window is Sootcast's own rule (docs/architecture.md, "Suggested window"): common trade
// practice, no published source.
describe('suggestedVisitWindow', () => {
	const now = new Date('2026-03-10T15:45:00Z');
	const crossing = (iso: string | null) => ({
		crossingEarliest: iso ? new Date(iso) : null,
		overLine: false
	});

	it('runs four weeks from tomorrow when no crossing is forecast', () => {
		const w = suggestedVisitWindow(now, crossing(null));
		expect(w.from.toISOString()).toBe('2026-03-11T00:00:00.000Z');
		expect(w.to.toISOString()).toBe('2026-04-08T00:00:00.000Z');
		expect(w.urgent).toBe(false);
	});

	it('ends the day before the earliest crossing', () => {
		const w = suggestedVisitWindow(now, crossing('2026-03-20T18:00:00Z'));
		expect(w.to.toISOString()).toBe('2026-03-19T00:00:00.000Z');
		expect(w.urgent).toBe(false);
	});

	it('keeps four weeks as the longest window when the crossing is far away', () => {
		const w = suggestedVisitWindow(now, crossing('2026-09-01T00:00:00Z'));
		expect(w.to.toISOString()).toBe('2026-04-08T00:00:00.000Z');
	});

	it('never ends after the crossing: a close or past crossing means as soon as possible', () => {
		for (const c of ['2026-03-11T08:00:00Z', '2026-03-13T08:00:00Z', '2026-02-01T00:00:00Z']) {
			const w = suggestedVisitWindow(now, crossing(c));
			expect(w.urgent, c).toBe(true);
			expect(w.to.toISOString(), c).toBe('2026-03-13T00:00:00.000Z');
		}
		// Three clear days before the crossing day: an ordinary window again.
		const w = suggestedVisitWindow(now, crossing('2026-03-14T08:00:00Z'));
		expect(w).toMatchObject({ urgent: false });
		expect(w.to.toISOString()).toBe('2026-03-13T00:00:00.000Z');
	});

	it('treats a van already over the line as urgent, not as a van with four weeks to spare', () => {
		const w = suggestedVisitWindow(now, { crossingEarliest: null, overLine: true });
		expect(w.urgent).toBe(true);
		expect(w.to.toISOString()).toBe('2026-03-13T00:00:00.000Z');
	});
});

describe('minutesOfDay', () => {
	it('counts minutes after midnight', () => {
		expect(minutesOfDay('07:30')).toBe(450);
		expect(minutesOfDay('00:00')).toBe(0);
		expect(minutesOfDay('23:45')).toBe(1425);
	});
});
