import { describe, expect, it } from 'vitest';
import { tickLabels } from './ticks';

describe('tickLabels (issue 13: readable axis ticks)', () => {
	it('a tiny range never prints 5e-10', () => {
		expect(tickLabels([0, 5e-10, 1e-9])).toEqual(['0', '0', '0']);
	});
	it('decimals follow the step; float noise is rounded away', () => {
		expect(tickLabels([0, 0.1, 0.2, 0.30000000000000004])).toEqual(['0.0', '0.1', '0.2', '0.3']);
		expect(tickLabels([40, 45, 50])).toEqual(['40', '45', '50']);
		expect(tickLabels([1.5, 1.55, 1.6])).toEqual(['1.50', '1.55', '1.60']);
		expect(tickLabels([1000, 2000])).toEqual(['1000', '2000']);
	});
	it('one tick', () => expect(tickLabels([7])).toEqual(['7']));
});
