import { db, schema } from './db';
import type { AuditKind } from './db/schema/audit';

/** Appends one event to the audit trail. */
export function recordAudit(event: {
	kind: AuditKind;
	clinicId?: string | null;
	actorUserId?: string | null;
	subject?: string;
	detail?: Record<string, unknown>;
}): void {
	db()
		.insert(schema.auditEvents)
		.values({
			kind: event.kind,
			clinicId: event.clinicId ?? null,
			actorUserId: event.actorUserId ?? null,
			subject: event.subject ?? '',
			detail: event.detail ?? null
		})
		.run();
}
