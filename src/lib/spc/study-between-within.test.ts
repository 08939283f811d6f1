import { describe, expect, it } from 'vitest';
import ref from '../../../reference/spc/between-within-example.json';
import { analyzeStudy } from '$lib/spc';
import { parseStudyForm } from './study-form';
import { studyView } from './study-view';

function form(fields: Record<string, string>): FormData {
	const f = new FormData();
	for (const [k, v] of Object.entries(fields)) f.append(k, v);
	return f;
}

describe('ad-hoc study page: between/within and mixed sizes', () => {
	it('between/within from pasted boards gives the API answer plus a moving-range pane', () => {
		const ex = ref.rangeExample;
		const data = ex.subgroups.map((g) => g.join(' ')).join('\n');
		const out = parseStudyForm(form({ chart: 'between-within', data, lsl: '8', usl: '16' }));
		if (!out.ok) throw new Error(JSON.stringify(out.errors));
		const view = studyView(out.request);
		if (!view.ok) throw new Error(JSON.stringify(view.errors));
		const api = analyzeStudy({ chart: 'between-within', subgroups: ex.subgroups, ...ex.specs });
		if (!api.ok) throw new Error('API refused the example');
		expect(view.result).toEqual(api.result);
		expect(view.chart.kind).toBe('between-within');
		expect(view.chart.limits.movingRange?.ucl).toBeCloseTo(ex.expected.movingRange.ucl, 5);
		expect(view.chart.points.map((p) => p.movingRange)).toEqual(ex.expected.movingRanges);
		expect(view.capability.result?.cpk).toBeCloseTo(ex.expected.cpk, 5);
	});

	it('mixed subgroup sizes: the page names the pasted line and the subgroup, as the API does', () => {
		const out = parseStudyForm(form({ chart: 'xbar-s', data: 'x y z\n1 2 3\n2 3 4\n5 6' }));
		if (!out.ok) throw new Error('parse failed');
		const view = studyView(out.request);
		if (view.ok) throw new Error('expected errors');
		expect(view.errors.map(out.where)).toEqual([
			{
				field: 'data',
				message:
					'line 4 (subgroups[2]): has 2 values but subgroup 0 has 3; X-bar/S needs equal subgroup sizes'
			}
		]);
	});
});
