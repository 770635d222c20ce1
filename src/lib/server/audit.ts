/** The audit trail: every change, with who, when, and the values before and after. */
import { db, schema, type Db } from './db';

export interface AuditEntry {
	action: string;
	entity: string;
	entityId?: string | number | null;
	userId?: string | null;
	actorEmail?: string | null;
	projectId?: number | null;
	before?: unknown;
	after?: unknown;
	ip?: string | null;
	at?: number;
}

/** Pass the transaction when the change itself runs in one, so both land or neither. */
export function record(entry: AuditEntry, tx: Pick<Db, 'insert'> = db): void {
	tx.insert(schema.auditEvents)
		.values({
			action: entry.action,
			entity: entry.entity,
			entityId: entry.entityId == null ? null : String(entry.entityId),
			userId: entry.userId ?? null,
			actorEmail: entry.actorEmail ?? null,
			projectId: entry.projectId ?? null,
			before: entry.before ?? null,
			after: entry.after ?? null,
			ip: entry.ip ?? null,
			...(entry.at ? { at: entry.at } : {})
		})
		.run();
}
