/**
 * What every route asks of its caller, by SvelteKit route id and method (and form action).
 * The hooks enforce it before any load, action or endpoint runs; the route matrix test reads
 * it to check every route in src/routes, and fails on a route this table does not know.
 */
// Relative, type-only imports: the route matrix test reads this table outside SvelteKit.
import type { GlobalAction, ProjectAction } from '../permissions';

export type Rule =
	| { access: 'public' }
	| { access: 'signed-in' }
	| { access: 'global'; action: GlobalAction }
	| { access: 'project'; action: ProjectAction };

export type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export interface RouteRules {
	GET?: Rule;
	POST?: Rule;
	PUT?: Rule;
	PATCH?: Rule;
	DELETE?: Rule;
	/** Form actions of a page, by name (`default` for the unnamed one). */
	actions?: Record<string, Rule>;
}

const PUBLIC: Rule = { access: 'public' };
const SIGNED_IN: Rule = { access: 'signed-in' };
const project = (action: ProjectAction): Rule => ({ access: 'project', action });
const global = (action: GlobalAction): Rule => ({ access: 'global', action });

export const ROUTES: Record<string, RouteRules> = {
	'/(auth)/signin': { GET: PUBLIC, actions: { default: PUBLIC } },
	'/(auth)/signin/link': { GET: PUBLIC, actions: { default: PUBLIC } },
	'/(auth)/signin/check-email': { GET: PUBLIC },
	'/(auth)/signin/problem': { GET: PUBLIC },
	'/(auth)/signout': { GET: PUBLIC, actions: { default: PUBLIC } },

	'/(app)': { GET: SIGNED_IN },
	'/(app)/projects': { GET: SIGNED_IN },
	'/(app)/projects/[projectId=id]': { GET: project('project.read') },
	'/(app)/projects/[projectId=id]/drawings': { GET: project('project.read') },
	'/(app)/projects/[projectId=id]/drawings/upload': { GET: project('drawing.upload') },
	'/(app)/projects/[projectId=id]/settings': {
		GET: project('project.settings'),
		actions: { default: project('project.settings') }
	},
	'/(app)/projects/[projectId=id]/settings/criteria': { GET: project('criteria.manage') },
	'/(app)/projects/[projectId=id]/drawings/[drawingId=id]': { GET: project('project.read') },
	'/(app)/projects/[projectId=id]/drawings/[drawingId=id]/revisions/[revisionId=id]': {
		GET: project('project.read')
	},
	'/(app)/projects/[projectId=id]/drawings/[drawingId=id]/details': {
		GET: project('drawing.edit'),
		actions: { default: project('drawing.edit') }
	},
	'/(app)/projects/[projectId=id]/drawings/[drawingId=id]/compare': {
		GET: project('project.read')
	},

	'/(app)/account': { GET: SIGNED_IN, actions: { password: SIGNED_IN } },
	'/(app)/account/tokens': { GET: SIGNED_IN, actions: { create: SIGNED_IN, revoke: SIGNED_IN } },

	'/(app)/admin/users': {
		GET: global('users.manage'),
		actions: {
			invite: global('users.manage'),
			disable: global('users.manage'),
			enable: global('users.manage'),
			reset: global('users.manage')
		}
	},
	'/(app)/admin/projects/[projectId=id]/members': {
		GET: global('users.manage'),
		actions: {
			add: global('users.manage'),
			role: global('users.manage'),
			remove: global('users.manage')
		}
	},
	'/(app)/admin/mail': { GET: global('mail.read') },
	'/(app)/admin/mail/[messageId=id]': { GET: global('mail.read') },

	'/api/health': { GET: PUBLIC },
	'/api/me': { GET: SIGNED_IN },
	'/api/projects': { GET: SIGNED_IN },
	'/api/tokens': { GET: SIGNED_IN, POST: SIGNED_IN },
	'/api/projects/[projectId=id]/drawings': {
		GET: project('project.read'),
		POST: project('drawing.upload')
	},
	'/api/projects/[projectId=id]/drawings/[drawingId=id]/revisions': {
		GET: project('project.read'),
		POST: project('drawing.upload')
	},
	'/api/projects/[projectId=id]/upload-permit': { GET: project('drawing.upload') },
	'/api/drawings/[drawingId=id]': { GET: project('project.read'), PATCH: project('drawing.edit') },
	'/api/revisions/[revisionId=id]': { GET: project('project.read') },
	'/api/revisions/[revisionId=id]/file': { GET: project('project.read') },
	// Tiles of a sheet: the same rule as the PDF they are drawn from.
	'/api/revisions/[revisionId=id]/tiles': { GET: project('project.read') },
	'/api/revisions/[revisionId=id]/tiles/[page]/[level]/[tile]': { GET: project('project.read') },
	'/api/projects/[projectId=id]/tiles': { GET: project('project.read') },
	'/api/revisions/[revisionId=id]/pins': {
		GET: project('project.read'),
		POST: project('pin.place')
	},
	'/api/pins/[pinId=id]': { PATCH: project('pin.move') },
	// Weld numbers read from the sheets: seen by all, read again, accepted or dismissed by placers.
	'/api/revisions/[revisionId=id]/suggestions': {
		GET: project('project.read'),
		POST: project('pin.place')
	},
	'/api/revisions/[revisionId=id]/suggestions/accept': { POST: project('pin.place') },
	'/api/revisions/[revisionId=id]/suggestions/dismiss': { POST: project('pin.place') },
	'/api/pins/[pinId=id]/confirm': { POST: project('pin.review') },
	'/api/joints/[jointId=id]': {
		GET: project('project.read'),
		PATCH: project('joint.edit'),
		// Undo of a pin placed by mistake: whoever may place pins.
		DELETE: project('pin.place')
	},
	'/api/joints/[jointId=id]/void': { POST: project('joint.void') },
	'/api/joints/[jointId=id]/cut-out': { POST: project('joint.cutout') },
	'/api/projects/[projectId=id]/events': { GET: project('project.read') },
	'/api/joints/[jointId=id]/inspections': {
		GET: project('project.read'),
		POST: project('inspection.record')
	},
	'/api/joints/[jointId=id]/welds': { GET: project('project.read'), POST: project('weld.record') },
	// -- photos on inspection records --
	'/api/inspections/[inspectionId=id]/photos': {
		GET: project('project.read'),
		POST: project('inspection.record')
	},
	'/api/inspections/[inspectionId=id]/photo-permit': { GET: project('inspection.record') },
	'/api/photos/[photoId=id]': { GET: project('project.read') },
	'/api/photos/[photoId=id]/thumbnail': { GET: project('project.read') },
	// -- weld log, summary and progress: entries below --
	'/(app)/projects/[projectId=id]/log': { GET: project('project.read') },
	'/(app)/projects/[projectId=id]/progress': { GET: project('project.read') },
	'/api/projects/[projectId=id]/joints': { GET: project('project.read') },
	'/api/projects/[projectId=id]/joints.csv': { GET: project('project.read') },
	'/api/projects/[projectId=id]/joints.xlsx': { GET: project('project.read') },
	'/api/projects/[projectId=id]/summary': { GET: project('project.read') },
	'/api/projects/[projectId=id]/progress': { GET: project('project.read') },
	// -- outstanding board, welders and inspection requests: entries below --
	'/(app)/projects/[projectId=id]/outstanding': { GET: project('project.read') },
	'/(app)/projects/[projectId=id]/welders': {
		GET: project('project.read'),
		actions: {
			create: project('welder.manage'),
			qualify: project('welder.manage'),
			status: project('welder.manage')
		}
	},
	'/api/projects/[projectId=id]/outstanding': { GET: project('project.read') },
	'/api/projects/[projectId=id]/welders': {
		GET: project('project.read'),
		POST: project('welder.manage')
	},
	'/api/projects/[projectId=id]/inspection-requests': {
		GET: project('project.read'),
		POST: project('inspection.request')
	},
	// -- turnover exports: entries below --
	'/(app)/projects/[projectId=id]/turnover': { GET: project('project.export') },
	'/api/projects/[projectId=id]/exports': {
		GET: project('project.export'),
		POST: project('project.export')
	},
	'/api/projects/[projectId=id]/exports/preview': { GET: project('project.export') },
	'/api/exports/[exportId=id]': {
		GET: project('project.export'),
		DELETE: project('project.export')
	},
	'/api/exports/[exportId=id]/file': {
		GET: project('project.export'),
		DELETE: project('project.export')
	},
	'/api/projects/[projectId=id]/criteria-sets': {
		GET: project('project.read'),
		POST: project('criteria.manage')
	},
	'/api/projects/[projectId=id]/criteria-sets/[setId]': { GET: project('project.read') },
	// -- the WPS register: entries below --
	'/(app)/projects/[projectId=id]/wps': {
		GET: project('project.read'),
		actions: {
			save: project('wps.manage'),
			preview: project('wps.manage'),
			import: project('wps.manage')
		}
	},
	'/(app)/projects/[projectId=id]/wps/template.csv': { GET: project('project.read') },
	'/api/projects/[projectId=id]/wps': { GET: project('project.read'), POST: project('wps.manage') },
	'/api/wps/[wpsId=id]': { GET: project('project.read'), PATCH: project('wps.manage') },
	'/api/acceptance/evaluate': { POST: SIGNED_IN },
	'/api/acceptance/criteria': { GET: SIGNED_IN },
	'/api/tokens/[tokenId=id]': { DELETE: SIGNED_IN },
	// -- NDE lots, selection, tracers and requests: entries below --
	'/(app)/projects/[projectId=id]/nde': { GET: project('project.read') },
	'/(app)/projects/[projectId=id]/settings/nde': {
		GET: project('project.settings'),
		actions: { default: project('project.settings') }
	},
	'/api/projects/[projectId=id]/nde/lots': { GET: project('project.read') },
	'/api/projects/[projectId=id]/nde/lots/[lotId=id]': { GET: project('project.read') },
	'/api/projects/[projectId=id]/nde/lots/[lotId=id]/selection': {
		GET: project('nde.select'),
		POST: project('nde.select')
	},
	'/api/projects/[projectId=id]/nde/lots/[lotId=id]/swap': { POST: project('nde.select') },
	'/api/projects/[projectId=id]/nde/lots/[lotId=id]/tracers': { POST: project('nde.select') },
	'/api/projects/[projectId=id]/nde/lots/[lotId=id]/close': { POST: project('nde.lot.manage') },
	'/api/projects/[projectId=id]/nde/lots/[lotId=id]/reopen': { POST: project('nde.lot.manage') },
	'/api/projects/[projectId=id]/nde/requests': {
		GET: project('project.read'),
		POST: project('nde.select')
	},
	'/api/projects/[projectId=id]/nde/repair-rates': { GET: project('project.read') },
	'/api/joints/[jointId=id]/nde': { GET: project('project.read') }
};

/** The rule for a request, or undefined when the table does not cover it (refused). */
export function ruleFor(routeId: string, method: string, search: string): Rule | undefined {
	const answer = routeRule(routeId, method, search);
	return answer.ok ? answer.rule : undefined;
}

export type RouteAnswer =
	| { ok: true; rule: Rule }
	| { ok: false; status: 400 | 404 | 405; message: string; allow?: string };

/** The methods a route answers, as an `Allow` header lists them. */
export function allowedMethods(routeId: string): string[] {
	const rules = ROUTES[routeId];
	if (!rules) return [];
	const page = !routeId.startsWith('/api/');
	const methods: string[] = [];
	if (rules.GET) methods.push('GET', 'HEAD');
	if (page ? rules.actions : rules.POST) methods.push('POST');
	if (!page) for (const m of ['PUT', 'PATCH', 'DELETE'] as const) if (rules[m]) methods.push(m);
	return methods;
}

/**
 * The form action a POST to a page names, read as SvelteKit reads it (the first query key
 * starting with `/`): undefined when none is named, null when the name is not valid
 * percent-encoding.
 */
export function actionName(search: string): string | null | undefined {
	const raw = search
		.replace(/^\?/, '')
		.split('&')
		.map((pair) => pair.split('=')[0])
		.find((key) => key.startsWith('/') || key.startsWith('%2F') || key.startsWith('%2f'));
	if (raw === undefined) return undefined;
	try {
		return decodeURIComponent(raw.replaceAll('+', ' ')).slice(1);
	} catch {
		return null;
	}
}

/**
 * What the route table says of a request: its rule, or the 4xx answer for a method the route
 * does not take (405 with `Allow`), a form action it does not have (404), or an action name
 * missing where the page has only named actions, or badly encoded (400).
 */
export function routeRule(routeId: string, method: string, search: string): RouteAnswer {
	const rules = ROUTES[routeId];
	if (!rules)
		return { ok: false, status: 404, message: 'This request is not one Tacksheet answers.' };
	const page = !routeId.startsWith('/api/');
	const asked = method === 'HEAD' ? 'GET' : method;
	const notAllowed = (): RouteAnswer => ({
		ok: false,
		status: 405,
		message: `${method} is not an answer this address gives; it takes ${allowedMethods(routeId).join(', ')}.`,
		allow: allowedMethods(routeId).join(', ')
	});
	if (page && asked === 'POST') {
		if (!rules.actions) return notAllowed();
		const name = actionName(search);
		if (name === null || name === 'default')
			return { ok: false, status: 400, message: 'The form action name is not valid.' };
		const rule = rules.actions[name ?? 'default'];
		if (rule) return { ok: true, rule };
		if (name === undefined)
			return {
				ok: false,
				status: 400,
				message: `Name the form action: ${Object.keys(rules.actions)
					.map((a) => `?/${a}`)
					.join(', ')}.`
			};
		return { ok: false, status: 404, message: `This page has no form action "${name}".` };
	}
	if (page && asked !== 'GET') return notAllowed();
	const rule = (['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const).includes(asked as Method)
		? rules[asked as Method]
		: undefined;
	return rule ? { ok: true, rule } : notAllowed();
}
