import { describe, expect, it } from 'vitest';
import { parseStepRegionsText, stencilFormSchema, thresholdsFormSchema } from './stencil-forms';

describe('parseStepRegionsText', () => {
	it('reads corners in mm and thickness in µm (1 mm = 1000 µm)', () => {
		expect(parseStepRegionsText('42.5 42.5 47.5 47.5 100\n\n0,0,10,5,150')).toEqual({
			regions: [
				{ xMinUm: 42500, yMinUm: 42500, xMaxUm: 47500, yMaxUm: 47500, thicknessUm: 100 },
				{ xMinUm: 0, yMinUm: 0, xMaxUm: 10000, yMaxUm: 5000, thicknessUm: 150 }
			]
		});
	});

	it.each([
		['', { regions: [] }],
		['   \n ', { regions: [] }]
	])('empty text %j gives no regions', (text, expected) => {
		expect(parseStepRegionsText(text)).toEqual(expected);
	});

	it.each([
		['1 2 3 4', 'five numbers'],
		['1 2 3 4 x', 'five numbers'],
		['10 0 5 5 100', 'xMaxUm'],
		['0 0 5 5 0', 'thicknessUm'],
		['0 0 5 5 2000', 'thicknessUm']
	])('refuses %j naming the problem', (text, fragment) => {
		const r = parseStepRegionsText(text);
		expect('error' in r && r.error).toContain(fragment);
	});
});

describe('stencil form schemas', () => {
	it('refuses a zero thickness and accepts a plain stencil', () => {
		const ok = stencilFormSchema.safeParse({ name: 'ST-1', revision: 'A', thicknessUm: 127 });
		expect(ok.success && ok.data).toMatchObject({ technology: 'laser-stainless', stepRegions: '' });
		const bad = stencilFormSchema.safeParse({ name: 'ST-1', revision: 'A', thicknessUm: 0 });
		expect(bad.success).toBe(false);
	});

	it.each([0, -0.1, 10.5, Number.NaN])('refuses a threshold of %s', (v) => {
		const t = { minAreaRatio: 0.66, minAspectRatio: 1.5 };
		const r = thresholdsFormSchema.safeParse({
			'laser-stainless': t,
			electroformed: { ...t, minAreaRatio: v },
			'laser-nano-coated': t,
			step: t
		});
		expect(r.success).toBe(false);
		if (!r.success) expect(r.error.issues[0].path).toEqual(['electroformed', 'minAreaRatio']);
	});
});
