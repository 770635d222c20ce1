import { describe, expect, it } from 'vitest';
import { safeReturnTo } from './return-to';

describe('return address after sign-in', () => {
	it('keeps a path on this site', () => {
		expect(safeReturnTo('/projects/2/drawings?kind=shop')).toBe('/projects/2/drawings?kind=shop');
	});
	it.each([
		'https://elsewhere.test/',
		'//elsewhere.test',
		'/\\elsewhere.test',
		'javascript:alert(1)',
		'',
		null,
		'/signin',
		'/auth/signout'
	])('refuses %s', (value) => {
		expect(safeReturnTo(value)).toBe('/projects');
	});
});
