/** How each forecast status looks: its words, a shape and colour classes. */
export type StatusKey = 'over_line' | 'crossing_soon' | 'watch' | 'healthy' | 'insufficient_data';

export const STATUS_LOOK: Record<
	StatusKey,
	{ label: string; shape: 'double' | 'chevron' | 'bar' | 'ring' | 'dot'; classes: string }
> = {
	over_line: { label: 'Past the line', shape: 'double', classes: 'bg-danger-soft text-danger' },
	crossing_soon: { label: 'Crossing soon', shape: 'chevron', classes: 'bg-warn-soft text-warn' },
	watch: { label: 'Keep an eye', shape: 'bar', classes: 'bg-info-soft text-info' },
	healthy: { label: 'Clearing well', shape: 'ring', classes: 'bg-ok-soft text-ok' },
	insufficient_data: { label: 'Too few readings', shape: 'dot', classes: 'bg-brand-soft text-ink-soft' }
};
