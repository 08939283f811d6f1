import { describe, expect, it } from 'vitest';
import { paretoRows } from './pareto';

describe('paretoRows (issue 13: cumulative percentage of every failure)', () => {
	it('a top-3 list of 20 failures reaches 75 %, not 100 %', () => {
		const rows = paretoRows([{ fails: 8 }, { fails: 4 }, { fails: 3 }], 20);
		expect(rows.map((r) => r.cumulativePct)).toEqual([40, 60, 75]);
		expect(rows.map((r) => r.barPct)).toEqual([100, 50, 37.5]);
	});
	it('all rows shown: the last reaches 100 %', () => {
		expect(paretoRows([{ fails: 1 }, { fails: 1 }], 2).map((r) => r.cumulativePct)).toEqual([
			50, 100
		]);
	});
	it('no failures: zeros, not NaN', () => {
		expect(paretoRows([{ fails: 0 }], 0)).toEqual([{ fails: 0, barPct: 0, cumulativePct: 0 }]);
	});
});
