/** What a visit report may carry, shared by the form (hints, `accept`) and the server (limits). */
export const ATTACHMENT_TYPES = {
	'image/jpeg': { label: 'JPEG photo', extension: 'jpg', isImage: true },
	'image/png': { label: 'PNG image', extension: 'png', isImage: true },
	'image/webp': { label: 'WebP image', extension: 'webp', isImage: true },
	'application/pdf': { label: 'PDF document', extension: 'pdf', isImage: false }
} as const;
export type AttachmentMediaType = keyof typeof ATTACHMENT_TYPES;

/** Per file: a phone photo is 2–6 MB, a scanned job sheet less. */
export const ATTACHMENT_MAX_BYTES = 10 * 1024 * 1024;
/** Per report, counting files added later. */
export const MAX_ATTACHMENTS_PER_REPORT = 10;

/** For the file input's `accept`: a hint to the picker only; the server judges the content. */
export const ATTACHMENT_ACCEPT = Object.entries(ATTACHMENT_TYPES)
	.map(([type, t]) => `${type},.${t.extension}`)
	.join(',');

export const ATTACHMENT_HINT = `Photos (JPEG, PNG, WebP) or PDF, up to 10 MB each and ${MAX_ATTACHMENTS_PER_REPORT} per report.`;
