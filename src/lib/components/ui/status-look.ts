import { STATUS_LABELS, type VanStatus } from '../../domain/status';

/** How each status looks: the domain's words, a shape and colour classes (never colour alone). */
export type StatusKey = VanStatus;

type Shape = 'double' | 'chevron' | 'bar' | 'cross' | 'ring' | 'dot';

const LOOK: Record<VanStatus, { shape: Shape; classes: string }> = {
	over_line: { shape: 'double', classes: 'bg-danger-soft text-danger' },
	crossing_soon: { shape: 'chevron', classes: 'bg-warn-soft text-warn' },
	check_sensor: { shape: 'cross', classes: 'bg-warn-soft text-warn' },
	watch: { shape: 'bar', classes: 'bg-info-soft text-info' },
	healthy: { shape: 'ring', classes: 'bg-ok-soft text-ok' },
	insufficient_data: { shape: 'dot', classes: 'bg-brand-soft text-ink-soft' }
};

export const STATUS_LOOK: Record<VanStatus, { label: string; shape: Shape; classes: string }> =
	Object.fromEntries(
		(Object.keys(LOOK) as VanStatus[]).map((s) => [s, { label: STATUS_LABELS[s], ...LOOK[s] }])
	) as Record<VanStatus, { label: string; shape: Shape; classes: string }>;
