/** One expected failure, answered one way by the API and one way by form actions. */
import { describe, expect, it } from 'vitest';
import { DomainError, apiFailure, formFailure } from '$lib/server/errors';

describe('domain errors', () => {
	it('answer an API call as JSON with the status, the message and the field', async () => {
		const response = apiFailure(new DomainError('Weld number 12 is already used.', 409, 'number'));
		expect(response.status).toBe(409);
		expect(await response.json()).toEqual({
			error: 'Weld number 12 is already used.',
			field: 'number'
		});
	});

	it('carry extras such as the id of the export already running', async () => {
		const response = apiFailure(
			new DomainError('The same turnover set is already being exported.', 409, undefined, {
				exportId: 7
			})
		);
		expect(await response.json()).toEqual({
			error: 'The same turnover set is already being exported.',
			id: 7
		});
	});

	it('answer a form action with fail(status) and the caller’s extras', () => {
		const failure = formFailure(
			new DomainError('There is no such welder.', 404, 'welderId'),
			undefined,
			{
				action: 'qualify'
			}
		);
		expect(failure.status).toBe(404);
		expect(failure.data).toEqual({
			action: 'qualify',
			error: true,
			message: 'There is no such welder.',
			field: 'welderId'
		});
	});

	it('throw anything else on, as a server fault', () => {
		const fault = new TypeError('x is undefined');
		expect(() => apiFailure(fault)).toThrow(fault);
		expect(() => formFailure(fault)).toThrow(fault);
	});
});
