import { describe, expect, it } from 'vitest';
import { minutesOfDay, suggestedVisitWindow } from './visits';

// The window is Sootcast's own rule (docs/architecture.md, "Suggested window"): common trade
// practice, no published source.
describe('suggestedVisitWindow', () => {
	const now = new Date('2026-03-10T15:45:00Z');

	it('runs four weeks from tomorrow when no crossing is forecast', () => {
		const w = suggestedVisitWindow(now, null);
		expect(w.from.toISOString()).toBe('2026-03-11T00:00:00.000Z');
		expect(w.to.toISOString()).toBe('2026-04-08T00:00:00.000Z');
	});

	it('ends the day before the earliest crossing', () => {
		const w = suggestedVisitWindow(now, new Date('2026-03-20T18:00:00Z'));
		expect(w.to.toISOString()).toBe('2026-03-19T00:00:00.000Z');
	});

	it('keeps four weeks as the longest window when the crossing is far away', () => {
		const w = suggestedVisitWindow(now, new Date('2026-09-01T00:00:00Z'));
		expect(w.to.toISOString()).toBe('2026-04-08T00:00:00.000Z');
	});

	it('leaves three days when the crossing is tomorrow or already past', () => {
		for (const crossing of ['2026-03-11T08:00:00Z', '2026-02-01T00:00:00Z']) {
			const w = suggestedVisitWindow(now, new Date(crossing));
			expect(w.to.toISOString(), crossing).toBe('2026-03-13T00:00:00.000Z');
		}
	});
});

describe('minutesOfDay', () => {
	it('counts minutes after midnight', () => {
		expect(minutesOfDay('07:30')).toBe(450);
		expect(minutesOfDay('00:00')).toBe(0);
		expect(minutesOfDay('23:45')).toBe(1425);
	});
});
