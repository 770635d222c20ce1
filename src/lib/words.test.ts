import { describe, expect, it } from 'vitest';
import { criteriaSetTitle, fileSize, noun, plural, recordLabel, yesNo } from './words';

describe('plural', () => {
	it('says one thing in the singular and every other count in the plural (English grammar)', () => {
		expect(plural(1, 'pin')).toBe('1 pin');
		expect(plural(0, 'pin')).toBe('0 pins');
		expect(plural(2, 'pin')).toBe('2 pins');
		expect(plural(-1, 'day')).toBe('-1 days');
		expect(plural(1.5, 'hour')).toBe('1.5 hours');
	});

	it('takes an irregular plural', () => {
		expect(plural(1, 'person', 'people')).toBe('1 person');
		expect(plural(3, 'person', 'people')).toBe('3 people');
		expect(plural(1, 'weld is', 'welds are')).toBe('1 weld is');
		expect(plural(4, 'weld is', 'welds are')).toBe('4 welds are');
		expect(plural(2, 'repair cycle')).toBe('2 repair cycles');
	});

	it('groups thousands', () => {
		expect(plural(12000, 'weld')).toBe('12,000 welds');
	});

	it('gives the word alone', () => {
		expect(noun(1, 'weld')).toBe('weld');
		expect(noun(7, 'weld')).toBe('welds');
	});
});

describe('file and record words', () => {
	it('writes yes and no one way', () => {
		expect(yesNo(true)).toBe('Yes');
		expect(yesNo(false)).toBe('No');
	});

	it('names a record by its number', () => {
		expect(recordLabel(123)).toBe('Record 123');
	});
});

describe('fileSize', () => {
	it('never says 0.0 MB for a small file', () => {
		expect(fileSize(1)).toBe('1 byte');
		expect(fileSize(812)).toBe('812 bytes');
		expect(fileSize(45 * 1024)).toBe('45 KB');
		expect(fileSize(3.2 * 1024 * 1024)).toBe('3.2 MB');
		expect(fileSize(48 * 1024 * 1024)).toBe('48 MB');
	});
});

describe('criteriaSetTitle', () => {
	it('names a set with its edition, and a project set with its version', () => {
		expect(criteriaSetTitle({ name: 'ASME B31.3 normal fluid service', edition: '2018' })).toBe(
			'ASME B31.3 normal fluid service (2018 edition)'
		);
		expect(criteriaSetTitle({ name: 'API 1104 girth welds', edition: '21st edition (2013)' })).toBe(
			'API 1104 girth welds (21st edition (2013))'
		);
		expect(
			criteriaSetTitle({ name: 'Site undercut', edition: '2018', version: 3, basedOn: {} })
		).toBe('Site undercut (2018 edition, project version 3)');
	});
});
