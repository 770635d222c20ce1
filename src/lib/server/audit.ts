/** The audit trail: every change, with who, when, and the values before and after. */
import { db, schema, type Db } from './db';

/** Every action the audit trail records, by what it changed. */
export const AUDIT_ACTIONS = [
	// records on a joint
	'create',
	'update',
	'renumber',
	'take_back',
	'void',
	'cut_out',
	'pin_move',
	'pin_confirm',
	'inspection',
	'inspection_correct',
	'weld',
	'inspection_request',
	'photo',
	// welders
	'continuity',
	'qualify',
	'requalify',
	'status',
	// drawings, criteria sets, projects
	'supersede',
	'revise',
	'settings_change',
	// people and access
	'invite',
	'role_change',
	'disable',
	'enable',
	'password_change',
	'password_reset',
	'token_create',
	'token_revoke',
	'sign_in',
	'sign_in_failed',
	'sign_in_refused',
	'sign_in_link_refused',
	'sign_out',
	// turnover sets
	'export.start',
	'export.cancel',
	'export.file.remove',
	'export.file.orphan',
	// NDE lots: forming, selection, swaps, tracers, closing, requests to the contractor
	'nde_lot_open',
	'nde_adopt',
	'nde_select',
	'nde_swap',
	'nde_tracers',
	'nde_tracers_again',
	'nde_lot_close',
	'nde_lot_reopen',
	'nde_request',
	// the demo job
	'seed'
] as const;
export type AuditAction = (typeof AUDIT_ACTIONS)[number];

export interface AuditEntry {
	action: AuditAction;
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
