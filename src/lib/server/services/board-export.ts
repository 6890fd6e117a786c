import type { SessionUser } from '../auth/lucia';
import type { BoardQueryInput } from '../../validation/board';
import { STATUS_LABELS } from '../../domain/status';
import { fromMbar, type PressureUnit } from '../../domain/units';
import { listBoard } from './board';
import { csvField } from '../http/csv';

export { csvField };

export const EXPORT_LIMIT = 10_000;

/** The board as CSV with the current filters and sort, pressures in the viewer's unit. */
export async function exportBoardCsv(user: SessionUser, query: BoardQueryInput): Promise<string> {
	const unit = user.unitPreference as PressureUnit;
	const { items } = await listBoard(user, { ...query, page: 1, pageSize: EXPORT_LIMIT });
	const day = (iso: string | null) => (iso ? iso.slice(0, 10) : null);
	const p = (mbar: number | null) =>
		mbar === null
			? null
			: Number(fromMbar(mbar, unit).toFixed(unit === 'mbar' || unit === 'hPa' ? 0 : 3));
	const header = [
		'registration',
		'fleet',
		'depot',
		'status',
		`latest_dp_${unit}`,
		`concern_line_${unit}`,
		`growth_${unit}_per_week`,
		'crossing_earliest',
		'crossing_expected',
		'crossing_latest',
		'confidence'
	];
	const lines = items.map((v) =>
		[
			v.registration,
			v.fleet,
			v.depot,
			v.status ? STATUS_LABELS[v.status] : 'Not forecast yet',
			p(v.latestMbar),
			p(v.concernLineMbar),
			p(v.growthMbarPerWeek),
			day(v.crossingEarliest),
			day(v.crossingExpected),
			day(v.crossingLatest),
			v.confidence
		]
			.map(csvField)
			.join(',')
	);
	return [header.join(','), ...lines].join('\r\n') + '\r\n';
}
