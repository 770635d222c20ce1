/**
 * Who may do what: one table from role to actions, used by the hooks, form actions, API
 * routes and the UI alike. Pure. Hiding a button is a courtesy; the server checks here.
 */

export const PROJECT_ROLES = [
	'doc_controller',
	'inspector',
	'foreman',
	'turnover',
	'viewer'
] as const;
export type ProjectRole = (typeof PROJECT_ROLES)[number];

export const ROLE_LABELS: Record<ProjectRole | 'admin', string> = {
	admin: 'Administrator',
	doc_controller: 'Document controller',
	inspector: 'Welding inspector',
	foreman: 'Welding foreman',
	turnover: 'Turnover team',
	viewer: 'Viewer'
};

/** Actions inside one project. */
export const PROJECT_ACTIONS = [
	'project.read',
	'project.export',
	'drawing.upload',
	'pin.place',
	'pin.move',
	'pin.review',
	'joint.edit',
	'joint.void',
	'joint.cutout',
	'inspection.record',
	'nde.select',
	/** close and reopen NDE lots: no role has it, so the QC manager (administrator) only */
	'nde.lot.manage',
	'weld.record',
	/** record a weld past a lapsed or expired welder qualification, with the reason: administrators only */
	'weld.override',
	'inspection.request',
	'welder.manage',
	'project.settings',
	/** derive and revise the project's own criteria sets: no role has it, so administrators only */
	'criteria.manage',
	/** the WPS register: the QC manager's, and the administrator is the QC manager */
	'wps.manage',
	/** NDE lot rules and lots: administrators only */
	'nde.lot.manage',
	/** a drawing's number, title, line, area and system */
	'drawing.edit'
] as const;
export type ProjectAction = (typeof PROJECT_ACTIONS)[number];

/** Actions outside any project; only the administrator has them. */
export const GLOBAL_ACTIONS = ['users.manage', 'mail.read'] as const;
export type GlobalAction = (typeof GLOBAL_ACTIONS)[number];

const ROLE_ACTIONS: Record<ProjectRole, readonly ProjectAction[]> = {
	doc_controller: [
		'project.read',
		'project.export',
		'drawing.upload',
		'drawing.edit',
		'pin.place',
		'pin.move',
		'pin.review',
		'joint.edit',
		'joint.void'
	],
	// Only an inspector signs inspection results. A cut-out is a QC decision (after repeated
	// repair failures or on request), so it is the inspector's and the QC manager's, not the
	// document controller's, who voids joints a revision deleted.
	inspector: [
		'project.read',
		'project.export',
		'pin.place',
		'pin.move',
		'pin.review',
		'joint.edit',
		'joint.void',
		'joint.cutout',
		'inspection.record',
		'nde.select',
		'weld.record'
	],
	foreman: ['project.read', 'weld.record', 'inspection.request', 'welder.manage'],
	turnover: ['project.read', 'project.export'],
	viewer: ['project.read', 'project.export']
};

/** The administrator may do everything, in every project, except sign inspections. */
const ADMIN_EXCLUDED: readonly ProjectAction[] = ['inspection.record'];

export interface Principal {
	isAdmin: boolean;
	/** Project id → the caller's role there. */
	roles: Readonly<Record<number, ProjectRole>>;
}

export function roleCan(role: ProjectRole | 'admin', action: ProjectAction): boolean {
	if (role === 'admin') return !ADMIN_EXCLUDED.includes(action);
	return ROLE_ACTIONS[role].includes(action);
}

/** May the caller see this project at all? Non-members get a 404, not a 403. */
export function isMember(principal: Principal, projectId: number): boolean {
	return principal.isAdmin || projectId in principal.roles;
}

export function can(principal: Principal, action: ProjectAction, projectId: number): boolean {
	const role = principal.roles[projectId];
	if (role && roleCan(role, action)) return true;
	return principal.isAdmin && roleCan('admin', action);
}

export function canGlobal(principal: Principal, _action: GlobalAction): boolean {
	return principal.isAdmin;
}

/** The projects the caller may see: every one for an administrator (undefined), else theirs. */
export function visibleProjectIds(principal: Principal): number[] | undefined {
	return principal.isAdmin ? undefined : Object.keys(principal.roles).map(Number);
}

/** The role a person acts in on a project, as shown beside their name. */
export function roleIn(
	principal: Principal,
	projectId: number | null
): ProjectRole | 'admin' | null {
	if (projectId != null && principal.roles[projectId]) return principal.roles[projectId];
	return principal.isAdmin ? 'admin' : null;
}
