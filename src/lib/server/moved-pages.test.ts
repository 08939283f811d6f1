import { describe, expect, it } from 'vitest';
import { movedPageTarget } from './moved-pages';

describe('moved pages', () => {
	it('sends the old print-run and paste-lot paths to the new ones, query kept', () => {
		expect(movedPageTarget('/runs', '')).toBe('/print-runs');
		expect(movedPageTarget('/runs/12', '?started=1')).toBe('/print-runs/12?started=1');
		expect(movedPageTarget('/runs/new', '?line=SMT-1')).toBe('/print-runs/new?line=SMT-1');
		expect(movedPageTarget('/paste', '')).toBe('/paste-lots');
		expect(movedPageTarget('/paste/LOT-7', '')).toBe('/paste-lots/LOT-7');
	});
	it('leaves other paths alone, including ones that only start with the same letters', () => {
		expect(movedPageTarget('/runsheet', '')).toBeUndefined();
		expect(movedPageTarget('/paste-lots/3', '')).toBeUndefined();
		expect(movedPageTarget('/print-runs', '')).toBeUndefined();
	});
});
