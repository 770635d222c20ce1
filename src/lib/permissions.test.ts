import { describe, expect, it } from 'vitest';
import { PROJECT_ROLES, can, roleCan, visibleProjectIds, type ProjectRole } from './permissions';

const holders = (action: Parameters<typeof roleCan>[1]) =>
	(['admin', ...PROJECT_ROLES] as (ProjectRole | 'admin')[]).filter((role) =>
		roleCan(role, action)
	);

// Who does what is the product's own table (DESIGN.md §1), common practice on site: the QC
// manager (the administrator) owns procedures, sampling and overrides; the document controller
// the drawings; only an inspector signs.
describe('who may do what', () => {
	it('lets only the administrator override a welder qualification check', () => {
		expect(holders('weld.override')).toEqual(['admin']);
	});

	it('gives the WPS register and NDE lots to the administrator, the QC manager', () => {
		expect(holders('wps.manage')).toEqual(['admin']);
		expect(holders('nde.lot.manage')).toEqual(['admin']);
	});

	it('lets the document controller and the administrator edit a drawing', () => {
		expect(holders('drawing.edit')).toEqual(['admin', 'doc_controller']);
	});

	it('keeps NDE selection with the inspector and the administrator, signing with the inspector', () => {
		expect(holders('nde.select')).toEqual(['admin', 'inspector']);
		expect(holders('inspection.record')).toEqual(['inspector']);
	});

	it('shows an administrator every project and anyone else theirs', () => {
		expect(visibleProjectIds({ isAdmin: true, roles: {} })).toBeUndefined();
		expect(visibleProjectIds({ isAdmin: false, roles: { 3: 'foreman', 7: 'viewer' } })).toEqual([
			3, 7
		]);
		expect(can({ isAdmin: false, roles: { 3: 'foreman' } }, 'weld.override', 3)).toBe(false);
	});
});
