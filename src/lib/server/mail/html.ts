/** Escapes text for HTML e-mail bodies. */
export function escapeHtml(value: string): string {
	return value
		.replace(/&/g, '&amp;')
		.replace(/</g, '&lt;')
		.replace(/>/g, '&gt;')
		.replace(/"/g, '&quot;')
		.replace(/'/g, '&#39;');
}

/**
 * Our plain e-mail frame: one column, real text, readable without images or colour. The body
 * is HTML the caller has already escaped.
 */
export function frameHtml(title: string, bodyHtml: string, footerHtml = ''): string {
	return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width"><title>${escapeHtml(title)}</title></head>
<body style="margin:0;background:#f6f4ef;color:#1c2426;font-family:Roboto,Arial,sans-serif;font-size:16px;line-height:1.5">
<div style="max-width:600px;margin:0 auto;padding:24px 16px">
<p style="margin:0 0 16px;font-weight:700;color:#1f3d3f;font-size:18px">Sootcast</p>
<div style="background:#ffffff;border:1px solid #d9d4c8;border-radius:12px;padding:20px">
<h1 style="margin:0 0 12px;font-size:20px;color:#1f3d3f">${escapeHtml(title)}</h1>
${bodyHtml}
</div>
<p style="margin:16px 0 0;font-size:13px;color:#4b5659">${footerHtml || 'You receive this because you have a Sootcast account.'}</p>
</div></body></html>`;
}

export function buttonHtml(href: string, label: string): string {
	return `<p style="margin:20px 0"><a href="${escapeHtml(href)}" style="display:inline-block;background:#1f3d3f;color:#ffffff;padding:10px 18px;border-radius:8px;text-decoration:none;font-weight:500">${escapeHtml(label)}</a></p>`;
}
