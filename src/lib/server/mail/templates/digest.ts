import { formatPressure, type PressureUnit } from '../../../domain/units';
import { escapeHtml, frameHtml } from '../html';

export interface DigestVan {
	registration: string;
	link: string;
	change: 'crossed_line' | 'entered_window' | 'recovered';
	statusLabel: string;
	latestMbar: number | null;
	concernMbar: number;
	growthMbarPerWeek: number | null;
	earliest: Date | null;
	expected: Date | null;
	latest: Date | null;
	intervalLevel: number;
	confidence: string | null;
	explanation: string;
}

const HEADLINE: Record<DigestVan['change'], string> = {
	crossed_line: 'Past the concern line',
	entered_window: 'Expected to cross soon',
	recovered: 'Back to a safe level'
};

/** The nightly digest for one person: every van whose status changed, with the numbers behind it. */
export function renderDigest(input: {
	name: string;
	vans: DigestVan[];
	unit: PressureUnit;
	locale: string;
	timeZone: string;
	settingsLink: string;
}) {
	const day = (d: Date | null) =>
		d
			? new Intl.DateTimeFormat(input.locale, {
					day: 'numeric',
					month: 'short',
					year: 'numeric',
					timeZone: input.timeZone
				}).format(d)
			: '—';
	const p = (mbar: number | null) => (mbar === null ? '—' : formatPressure(mbar, input.unit));
	const perWeek = (mbar: number | null) =>
		mbar === null
			? '—'
			: `${mbar >= 0 ? '+' : '−'}${formatPressure(Math.abs(mbar), input.unit)} per week`;
	const worrying = input.vans.filter((v) => v.change !== 'recovered').length;
	const subject =
		worrying > 0
			? `Sootcast: ${worrying} van${worrying === 1 ? '' : 's'} need${worrying === 1 ? 's' : ''} a filter visit`
			: `Sootcast: ${input.vans.length} van${input.vans.length === 1 ? '' : 's'} back to a safe level`;

	const lines = input.vans.map((v) => {
		const crossing =
			v.change === 'recovered'
				? ''
				: v.expected
					? `\n  Expected crossing: ${day(v.expected)} (${Math.round(v.intervalLevel * 100)} % likely between ${day(v.earliest)} and ${day(v.latest)})`
					: '';
		return `${v.registration} — ${HEADLINE[v.change]} (${v.statusLabel})
  Latest Δp: ${p(v.latestMbar)} against a line of ${p(v.concernMbar)}; growth ${perWeek(v.growthMbarPerWeek)}${crossing}
  Confidence: ${v.confidence ?? '—'}. ${v.explanation}
  Open the van: ${v.link}`;
	});
	const text = `Hello ${input.name},

Last night's forecast changed for ${input.vans.length} van${input.vans.length === 1 ? '' : 's'}:

${lines.join('\n\n')}

Change which messages you receive: ${input.settingsLink}
`;

	const rows = input.vans
		.map(
			(v) => `<tr>
<td style="padding:8px 6px;border-bottom:1px solid #e6e1d6;vertical-align:top"><a href="${escapeHtml(v.link)}" style="color:#2b5580;font-weight:500">${escapeHtml(v.registration)}</a><br><span style="font-size:13px">${escapeHtml(HEADLINE[v.change])}</span></td>
<td style="padding:8px 6px;border-bottom:1px solid #e6e1d6;vertical-align:top">${escapeHtml(p(v.latestMbar))}<br><span style="font-size:13px;color:#4b5659">line ${escapeHtml(p(v.concernMbar))}</span></td>
<td style="padding:8px 6px;border-bottom:1px solid #e6e1d6;vertical-align:top">${v.change === 'recovered' ? '—' : `${escapeHtml(day(v.expected))}<br><span style="font-size:13px;color:#4b5659">${escapeHtml(day(v.earliest))} – ${escapeHtml(day(v.latest))}</span>`}</td>
</tr>
<tr><td colspan="3" style="padding:4px 6px 12px;font-size:14px;color:#4b5659;border-bottom:1px solid #d9d4c8">${escapeHtml(v.explanation)}</td></tr>`
		)
		.join('');
	const html = frameHtml(
		subject.replace(/^Sootcast: /, ''),
		`<p>Hello ${escapeHtml(input.name)},</p><p>Last night's forecast changed for these vans.</p>
<table role="presentation" style="width:100%;border-collapse:collapse;font-size:15px">
<thead><tr><th align="left" style="padding:6px;font-size:13px;color:#4b5659">Van</th><th align="left" style="padding:6px;font-size:13px;color:#4b5659">Latest Δp</th><th align="left" style="padding:6px;font-size:13px;color:#4b5659">Expected crossing</th></tr></thead>
<tbody>${rows}</tbody></table>`,
		`You receive this digest because it is switched on in your <a href="${escapeHtml(input.settingsLink)}" style="color:#2b5580">Sootcast settings</a>.`
	);
	return { subject, text, html };
}
