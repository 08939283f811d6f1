import { describe, it, expect } from 'vitest';
import { DEFAULT_THRESHOLDS, resolveThresholds, STENCIL_TECHNOLOGIES } from './thresholds';

describe('resolveThresholds', () => {
	it('defaults are the IPC-7525 guideline 0.66 / 1.5 for every technology (trade-press citations)', () => {
		for (const t of STENCIL_TECHNOLOGIES)
			expect(resolveThresholds(t)).toEqual({ minAreaRatio: 0.66, minAspectRatio: 1.5 });
	});
	it('site override replaces only the given field of the given technology', () => {
		const o = { electroformed: { minAreaRatio: 0.55 } };
		expect(resolveThresholds('electroformed', o)).toEqual({
			minAreaRatio: 0.55,
			minAspectRatio: 1.5
		});
		expect(resolveThresholds('laser-stainless', o)).toEqual({
			minAreaRatio: 0.66,
			minAspectRatio: 1.5
		});
	});
	it('an explicit undefined in overrides keeps the default', () => {
		expect(resolveThresholds('step', { step: { minAreaRatio: undefined } }).minAreaRatio).toBe(
			0.66
		);
	});
	it('does not mutate the defaults', () => {
		resolveThresholds('electroformed', { electroformed: { minAreaRatio: 0.5 } });
		expect(DEFAULT_THRESHOLDS.electroformed.minAreaRatio).toBe(0.66);
	});
	const bad: [string, unknown][] = [
		['zero', 0],
		['negative', -0.5],
		['NaN', NaN],
		['absurd', 50],
		['string', '0.6']
	];
	for (const [name, v] of bad)
		it(`rejects a ${name} override`, () => {
			expect(() =>
				resolveThresholds('electroformed', { electroformed: { minAreaRatio: v as number } })
			).toThrow(/site thresholds for electroformed, minAreaRatio: must be a number/);
		});
	it('rejects an unknown technology', () => {
		expect(() => resolveThresholds('chemical-etch' as never)).toThrow(
			/stencil, technology: unknown technology "chemical-etch"/
		);
	});
});
