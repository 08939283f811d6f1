import { describe, expect, it } from 'vitest';
import { causeChoiceError, cleanList, DEFAULT_CAUSE_LISTS } from './cause-lists';

describe('cause lists', () => {
	it('cleans an edited list: trimmed, blank and repeated entries dropped, bounded', () => {
		expect(cleanList([' Wipe stencil ', '', 'Wipe stencil', 'Adjust speed'])).toEqual([
			'Wipe stencil',
			'Adjust speed'
		]);
		expect(cleanList(['x'.repeat(100)])[0]).toHaveLength(80);
		expect(cleanList(Array.from({ length: 70 }, (_, i) => `Cause ${i}`))).toHaveLength(60);
	});

	it('refuses a cause or action not on the lists, naming the field', () => {
		const lists = DEFAULT_CAUSE_LISTS;
		expect(causeChoiceError(lists, lists.causes[0], lists.actions[0])).toBeNull();
		expect(causeChoiceError(lists, 'Gremlins', lists.actions[0])?.field).toBe('cause');
		expect(causeChoiceError(lists, lists.causes[0], 'Pray')).toMatchObject({
			field: 'action',
			message: expect.stringContaining('"Pray" is not in the list of corrective actions')
		});
	});
});
