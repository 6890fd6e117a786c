/**
 * Photos and PDFs on visit reports. Files stream to storage while their first bytes are
 * sniffed; only JPEG, PNG, WebP and PDF content is kept, whatever the name or declared type.
 * A row is written only for a file that landed whole, and a file whose row could not be
 * written is removed again, so storage and database never disagree.
 */
import { Op, Transaction } from 'sequelize';
import { getDb, Vehicle, VisitReport, VisitReportAttachment } from '../db';
import type { SessionUser } from '../auth/lucia';
import {
	createFileWriter,
	FileTooLargeError,
	formatBytes,
	newKey,
	openRead,
	removeFile,
	removingOnBreak
} from '../storage';
import { MEDIA_SNIFF_BYTES, sniffContent, sniffMediaType } from '../storage/sniff';
import {
	ATTACHMENT_MAX_BYTES,
	ATTACHMENT_TYPES,
	MAX_ATTACHMENTS_PER_REPORT,
	type AttachmentMediaType
} from '../../attachments';
import { ForbiddenError, NotFoundError, PayloadTooLargeError, ValidationError } from './errors';
import { vehicleScope } from './scope';
import { recordAudit } from './audit';

/** A file written to storage, waiting for its row. */
export interface StoredAttachment {
	key: string;
	fileName: string;
	mediaType: AttachmentMediaType;
	sizeBytes: number;
	sha256: string;
}

export interface AttachmentView {
	id: number;
	fileName: string;
	mediaType: string;
	label: string;
	isImage: boolean;
	sizeBytes: number;
	/** The guarded download address, also used for thumbnails. */
	url: string;
	createdAt: Date;
}

const refused = (message: string) => new ValidationError(message, { attachments: message });

function wrongTypeMessage(fileName: string, head: Uint8Array): string {
	const sniffed = sniffContent(head, true);
	if (sniffed.kind === 'empty') return `“${fileName}” is empty. Choose the photo or PDF again.`;
	const what =
		sniffed.kind === 'binary' && sniffed.looksLike ? `it looks like ${sniffed.looksLike}` : null;
	return `“${fileName}” is not a photo (JPEG, PNG, WebP) or a PDF${what ? `: ${what}` : ', whatever its name says'}. Attach photos or PDF documents only.`;
}

/**
 * Streams one file to storage. Refuses it by content as soon as its first bytes are in, and
 * past the size limit; either way nothing is kept and the rest of the file is read and dropped.
 * @throws ValidationError or PayloadTooLargeError, each naming the file
 */
export async function storeAttachment(
	user: SessionUser,
	file: { fileName: string; body: AsyncIterable<Uint8Array> },
	now = new Date()
): Promise<StoredAttachment> {
	if (user.role !== 'workshop') throw new ForbiddenError('Only the workshop attaches files.');
	const fileName = file.fileName.replace(/[\\/\r\n"]/g, '_').slice(0, 255) || 'attachment';
	const writer = await createFileWriter(newKey(user.organisationId, 'att', now), {
		maxBytes: ATTACHMENT_MAX_BYTES
	});
	let head = new Uint8Array(0);
	let mediaType: AttachmentMediaType | null = null;
	let failure: unknown = null;
	for await (const chunk of removingOnBreak(file.body, writer)) {
		if (failure) continue; // drain, so the answer still reaches the sender
		try {
			if (head.length < MEDIA_SNIFF_BYTES) {
				head = Uint8Array.from([...head, ...chunk.subarray(0, MEDIA_SNIFF_BYTES - head.length)]);
				if (head.length === MEDIA_SNIFF_BYTES) {
					mediaType = sniffMediaType(head);
					if (!mediaType) throw refused(wrongTypeMessage(fileName, head));
				}
			}
			await writer.write(chunk);
		} catch (err) {
			failure = err;
			await writer.abort();
		}
	}
	if (!failure && !mediaType) {
		failure = refused(wrongTypeMessage(fileName, head));
		await writer.abort();
	}
	if (failure instanceof FileTooLargeError) {
		throw new PayloadTooLargeError(
			`“${fileName}” is larger than the ${formatBytes(ATTACHMENT_MAX_BYTES)} a file may be. Send a smaller photo or a compressed PDF.`
		);
	}
	if (failure) throw failure;
	const stored = await writer.finish();
	return {
		key: stored.key,
		fileName,
		mediaType: mediaType!,
		sizeBytes: stored.sizeBytes,
		sha256: stored.sha256
	};
}

/** Removes files whose rows were never written (a refused form, a failed transaction). */
export async function discardStored(files: StoredAttachment[]): Promise<void> {
	await Promise.all(files.map((f) => removeFile(f.key)));
}

export const tooManyAtOnce = () =>
	refused(`Attach at most ${MAX_ATTACHMENTS_PER_REPORT} files at a time.`);

/** Rows for stored files on a report, inside the caller's transaction, within the count limit. */
export async function insertAttachments(
	reportId: number,
	files: StoredAttachment[],
	user: SessionUser,
	now: Date
): Promise<void> {
	if (!files.length) return;
	const existing = await VisitReportAttachment.count({ where: { visitReportId: reportId } });
	if (existing + files.length > MAX_ATTACHMENTS_PER_REPORT) {
		const room = MAX_ATTACHMENTS_PER_REPORT - existing;
		throw refused(
			`A report can hold at most ${MAX_ATTACHMENTS_PER_REPORT} files. ` +
				(room > 0
					? `This one has ${existing}, so choose at most ${room} more.`
					: 'This one is full: remove a file first.')
		);
	}
	for (const f of files) {
		await VisitReportAttachment.create({
			visitReportId: reportId,
			storageKey: f.key,
			fileName: f.fileName,
			mediaType: f.mediaType,
			sizeBytes: f.sizeBytes,
			sha256: f.sha256,
			uploadedById: user.id,
			createdAt: now
		});
	}
}

/**
 * Whether this person may open a report's files: the fleet whose van it is, and the workshop
 * that wrote it. Other workshops of the same fleet see the report but not its files.
 */
export function mayOpenAttachments(user: SessionUser, report: VisitReport): boolean {
	if (user.role === 'fleet_manager') return true; // the caller has checked the van's scope
	return user.role === 'workshop' && report.workshopId === user.organisationId;
}

/** A report whose files this person may open (or change, for its workshop), else NotFoundError. */
async function findReport(
	user: SessionUser,
	reportId: number,
	options: { write: boolean },
	now = new Date()
): Promise<VisitReport> {
	const report = await VisitReport.findByPk(reportId, {
		lock: options.write ? Transaction.LOCK.UPDATE : undefined
	});
	const visible =
		report &&
		(await Vehicle.count({
			where: { [Op.and]: [await vehicleScope(user, now), { id: report.vehicleId }] }
		}));
	if (!report || !visible || !mayOpenAttachments(user, report))
		throw new NotFoundError('That visit report');
	if (options.write && user.role !== 'workshop')
		throw new ForbiddenError('Only the workshop that wrote the report changes its files.');
	return report;
}

export async function listAttachments(reportId: number): Promise<AttachmentView[]> {
	const rows = await VisitReportAttachment.findAll({
		where: { visitReportId: reportId },
		order: [['id', 'ASC']]
	});
	return rows.map((a) => {
		const type = ATTACHMENT_TYPES[a.mediaType as AttachmentMediaType];
		return {
			id: a.id,
			fileName: a.fileName,
			mediaType: a.mediaType,
			label: type?.label ?? a.mediaType,
			isImage: type?.isImage ?? false,
			sizeBytes: Number(a.sizeBytes),
			url: `/api/v1/visit-reports/${reportId}/attachments/${a.id}`,
			createdAt: a.createdAt
		};
	});
}

/** Adds stored files to a report the workshop wrote; on any refusal the files are removed. */
export async function attachToReport(
	user: SessionUser,
	reportId: number,
	files: StoredAttachment[],
	now = new Date()
): Promise<number> {
	try {
		if (!files.length) throw refused('Choose one or more photos or PDF files to attach.');
		await getDb().transaction(async () => {
			const report = await findReport(user, reportId, { write: true }, now);
			await insertAttachments(report.id, files, user, now);
			await recordAudit(
				user,
				'visit_report.attach',
				'visit_report',
				report.id,
				{ files: files.map((f) => ({ name: f.fileName, sha256: f.sha256 })) },
				now
			);
		});
	} catch (err) {
		await discardStored(files);
		throw err;
	}
	return files.length;
}

/** Removes one file from a report the workshop wrote: the row first, then the bytes. */
export async function removeAttachment(
	user: SessionUser,
	reportId: number,
	attachmentId: number,
	now = new Date()
): Promise<string> {
	const removed = await getDb().transaction(async () => {
		const report = await findReport(user, reportId, { write: true }, now);
		const row = await VisitReportAttachment.findOne({
			where: { id: attachmentId, visitReportId: report.id }
		});
		if (!row) throw new NotFoundError('That file');
		await row.destroy();
		await recordAudit(
			user,
			'visit_report.detach',
			'visit_report',
			report.id,
			{ name: row.fileName, sha256: row.sha256 },
			now
		);
		return row;
	});
	// After the commit: a failed transaction must not lose the bytes of a row that stays
	await removeFile(removed.storageKey);
	return removed.fileName;
}

/** One file for download, if this person may open the report's files; else NotFoundError. */
export async function openAttachment(user: SessionUser, reportId: number, attachmentId: number) {
	const report = await findReport(user, reportId, { write: false });
	const row = await VisitReportAttachment.findOne({
		where: { id: attachmentId, visitReportId: report.id }
	});
	if (!row) throw new NotFoundError('That file');
	return {
		fileName: row.fileName,
		mediaType: row.mediaType,
		isImage: ATTACHMENT_TYPES[row.mediaType as AttachmentMediaType]?.isImage ?? false,
		sizeBytes: Number(row.sizeBytes),
		sha256: row.sha256,
		stream: () => openRead(row.storageKey)
	};
}
