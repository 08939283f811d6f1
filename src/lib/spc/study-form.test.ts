import { describe, expect, it } from 'vitest';
import { parseStudyForm } from './study-form';
import { studyView } from './study-view';
import { characteristicFromForm } from './characteristic-form';

function form(fields: Record<string, string | string[]>): FormData {
	const f = new FormData();
	for (const [k, v] of Object.entries(fields)) for (const x of [v].flat()) f.append(k, x);
	return f;
}

describe('parseStudyForm', () => {
	it('reads rows as subgroups, specs and rules', () => {
		const out = parseStudyForm(
			form({
				chart: 'xbar-r',
				data: 'a b\n1 2\n\n3 5',
				lsl: '0,5',
				usl: '9',
				rules: ['we-1', 'bogus']
			})
		);
		expect(out.ok && out.request).toEqual({
			chart: 'xbar-r',
			subgroups: [
				[1, 2],
				[3, 5]
			],
			lsl: 0.5,
			usl: 9,
			target: null,
			rules: ['we-1']
		});
	});

	it('for I-MR every number is a value in reading order', () => {
		const out = parseStudyForm(form({ chart: 'i-mr', data: '1 2\n3' }));
		expect(out.ok && out.request.values).toEqual([1, 2, 3]);
	});

	it.each([
		[{ chart: 'p', data: '1 2' }, 'chart'],
		[{ chart: 'i-mr', data: '1 2', lsl: 'low' }, 'lsl'],
		[{ chart: 'i-mr', data: '' }, 'data']
	])('%j is refused at %s', (fields, field) => {
		const out = parseStudyForm(form(fields));
		expect(out.ok).toBe(false);
		if (!out.ok) expect(out.errors.map((e) => e.field)).toContain(field);
	});

	it('names the pasted line of an engine error (blank lines counted)', () => {
		const out = parseStudyForm(form({ chart: 'xbar-r', data: '1 2\n\n3 4 5' }));
		if (!out.ok) throw new Error('parse failed');
		const view = studyView(out.request);
		expect(view.ok).toBe(false);
		if (!view.ok)
			expect(view.errors.map(out.where)[0].message).toMatch(/^line 3 \(subgroups\[1\]\)/);
	});
});

describe('characteristicFromForm', () => {
	it('maps fields, blank specs to null and pad selections', () => {
		const out = characteristicFromForm(
			form({
				name: ' V ',
				productId: '2',
				lineIds: ['1', '3'],
				measure: 'volume-pct',
				padKind: 'refdes',
				refdes: 'U1, R2 C3',
				chartKind: 'between-within',
				lsl: '',
				usl: '150',
				rules: ['we-1']
			})
		);
		expect(out).toMatchObject({
			name: 'V',
			productId: 2,
			lineIds: [1, 3],
			padSelection: { kind: 'refdes', refdes: ['U1', 'R2', 'C3'] },
			lsl: null,
			usl: 150,
			rules: ['we-1']
		});
	});
});
