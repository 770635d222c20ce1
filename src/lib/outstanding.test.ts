import { describe, expect, it } from 'vitest';
import { formatAge, OWED_STATES } from './outstanding';

describe('outstanding', () => {
	it('writes ages in days and hours', () => {
		const h = 3_600_000;
		expect(formatAge(20 * 60_000)).toBe('under 1 h');
		expect(formatAge(5 * h + 59 * 60_000)).toBe('5 h');
		expect(formatAge(3 * 24 * h + 4 * h + 10)).toBe('3 d 4 h');
		expect(formatAge(24 * h)).toBe('1 d 0 h');
	});

	it('gives the foreman welding and repairs and the inspector the examinations', () => {
		expect(OWED_STATES.foreman).toEqual(['fitup_rejected', 'ready_to_weld', 'repair']);
		expect(OWED_STATES.inspector).toEqual(['awaiting_fitup', 'awaiting_visual', 'awaiting_nde']);
	});
});
