import { AuditLog } from '../db';
import type { SessionUser } from '../auth/lucia';

export async function recordAudit(
	user: SessionUser | null,
	action: string,
	entity: string,
	entityId: number | string | null,
	details?: unknown,
	now = new Date()
): Promise<void> {
	await AuditLog.create({
		organisationId: user?.organisationId ?? null,
		userId: user?.id ?? null,
		action,
		entity,
		entityId: entityId === null ? null : String(entityId),
		details: (details ?? null) as Record<string, unknown> | null,
		at: now
	});
}
