import { describe, it, expect } from 'vitest';
import ref from '../../../reference/printlog/check-values.json';
import {
	STENCIL_LIFE_WARN_PCT,
	STENCIL_STATES,
	assessStencilForRun,
	stencilTransitionProblem
} from './stencil-life';
import type { StencilState } from './stencil-life';

describe('stencil life thresholds', () => {
	it('warns from the 90 % in the reference file', () => {
		expect(STENCIL_LIFE_WARN_PCT).toBe(ref.stencil.warnAtLifeUsedPct.value);
	});

	// Rated life 1000 prints, so the count is ten times the percentage.
	const cases: [number, number, string | undefined, string | undefined][] = [
		[0, 0, undefined, undefined],
		[899, 89.9, undefined, undefined],
		[900, 90, undefined, 'near-rated-life'],
		[999, 99.9, undefined, 'near-rated-life'],
		[1000, 100, 'past-rated-life', undefined],
		[1010, 101, 'past-rated-life', undefined]
	];
	it.each(cases)('%s prints of 1000 → %s %%', (printCount, pct, refuse, warn) => {
		const result = assessStencilForRun({
			name: 'ST-1',
			state: 'in-use',
			printCount,
			ratedLifePrints: 1000
		});
		expect(result.lifeUsedPct).toBeCloseTo(pct, 9);
		expect(result.refuse?.code).toBe(refuse);
		expect(result.warn?.code).toBe(warn);
		expect(result.canOverride).toBe(refuse !== undefined);
	});

	it('words the messages', () => {
		expect(
			assessStencilForRun({
				name: 'ST-1',
				state: 'available',
				printCount: 900,
				ratedLifePrints: 1000
			}).warn?.message
		).toBe('stencil ST-1 has used 90 % of its rated life (900 of 1000 prints)');
		expect(
			assessStencilForRun({
				name: 'ST-1',
				state: 'available',
				printCount: 1010,
				ratedLifePrints: 1000
			}).refuse?.message
		).toBe(
			'stencil ST-1 has reached its rated life (1010 of 1000 prints): an engineer must override with a reason'
		);
	});

	it('without a rated life there is no life check', () => {
		expect(
			assessStencilForRun({ state: 'in-use', printCount: 10 ** 6, ratedLifePrints: null })
		).toEqual({
			lifeUsedPct: null,
			canOverride: false,
			overridden: false
		});
	});
});

describe('stencil states and override', () => {
	const cases: [StencilState, string | undefined, boolean, boolean][] = [
		// state, refuse code, canOverride, lifted by 'engineer OK'
		['available', undefined, false, false],
		['in-use', undefined, false, false],
		['out-for-cleaning', 'out-for-cleaning', false, false],
		['quarantined', 'quarantined', true, true],
		['retired', 'retired', false, false]
	];
	it.each(cases)('%s', (state, refuse, canOverride, lifted) => {
		const plain = assessStencilForRun({ state, printCount: 10, ratedLifePrints: 1000 });
		expect(plain.refuse?.code).toBe(refuse);
		expect(plain.canOverride).toBe(canOverride);
		const overridden = assessStencilForRun(
			{ state, printCount: 10, ratedLifePrints: 1000 },
			'engineer OK'
		);
		expect(overridden.overridden).toBe(lifted);
		expect(overridden.refuse === undefined).toBe(refuse === undefined || lifted);
	});

	it('an override lifts past-life, turning it into a warning that keeps the reason', () => {
		const result = assessStencilForRun(
			{ name: 'ST-2', state: 'in-use', printCount: 1200, ratedLifePrints: 1000 },
			'  inspected, tension 41 N/cm '
		);
		expect(result.refuse).toBeUndefined();
		expect(result.warn).toEqual({
			code: 'past-rated-life',
			message:
				'stencil ST-2 has reached its rated life (1200 of 1000 prints); overridden: inspected, tension 41 N/cm'
		});
	});

	it.each([[''], ['   '], [null], [undefined]])(
		'a blank override reason %j lifts nothing',
		(reason) => {
			expect(
				assessStencilForRun({ state: 'quarantined', printCount: 0 }, reason).refuse?.code
			).toBe('quarantined');
		}
	);

	const invalid: [Record<string, unknown>, RegExp][] = [
		[{ state: 'lost', printCount: 0 }, /state must be one of/],
		[{ state: 'in-use', printCount: -1 }, /printCount must be a whole number ≥ 0 \(got -1\)/],
		[{ state: 'in-use', printCount: Number.NaN }, /got NaN/],
		[
			{ state: 'in-use', printCount: 5, ratedLifePrints: 0 },
			/ratedLifePrints must be a whole number > 0 \(got 0\)/
		]
	];
	it.each(invalid)('bad input %j is refused, not thrown', (input, message) => {
		const result = assessStencilForRun(input as never);
		expect(result.refuse?.code).toBe('invalid');
		expect(result.refuse?.message).toMatch(message);
	});
});

describe('stencilTransitionProblem', () => {
	const allowed: Record<StencilState, StencilState[]> = {
		available: ['in-use', 'out-for-cleaning', 'quarantined', 'retired'],
		'in-use': ['available', 'out-for-cleaning', 'quarantined', 'retired'],
		'out-for-cleaning': ['available', 'quarantined', 'retired'],
		quarantined: ['available', 'out-for-cleaning', 'retired'],
		retired: []
	};
	const rows = STENCIL_STATES.flatMap((from) =>
		STENCIL_STATES.map((to) => [from, to, allowed[from].includes(to)] as const)
	);
	it.each(rows)('%s → %s allowed %s', (from, to, ok) => {
		const problem = stencilTransitionProblem(from, to);
		if (ok) expect(problem).toBeNull();
		else expect(problem).toMatch(/\w/);
	});
	it('explains quarantine release and retirement', () => {
		expect(stencilTransitionProblem('quarantined', 'in-use')).toMatch(
			/released \(to available\) by an engineer/
		);
		expect(stencilTransitionProblem('retired', 'available')).toBe(
			'a retired stencil cannot change state'
		);
		expect(stencilTransitionProblem('available', 'lost')).toMatch(
			/state must be one of .* \(got "lost"\)/
		);
	});
});
