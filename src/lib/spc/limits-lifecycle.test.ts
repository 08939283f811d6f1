import { describe, expect, it } from 'vitest';
import ref from '../../../reference/spc/worked-examples.json';
import type { SourceSubgroup } from './chart-input';
import {
	baselineLimits,
	exclusionReason,
	isMinBaselineSubgroups,
	LimitsError
} from './limits-lifecycle';

const nist = ref.nistIndividualsFlowRate;
const c = { chartKind: 'i-mr' };
const at = (i: number) => new Date(Date.UTC(2026, 0, 1, 0, i));
const runs = (values: readonly number[]): SourceSubgroup[] =>
	values.map((v, i) => ({
		key: `run:${i + 1}`,
		label: `run ${i + 1}`,
		boardId: null,
		boardIds: [],
		at: at(i),
		values: [v]
	}));

describe('baselineLimits', () => {
	it('limits of the NIST individuals example, with the baseline period and points used', () => {
		const out = baselineLimits(c, runs(nist.values), [], {}, 10);
		expect(Math.abs(out.limits.location.ucl - nist.ucl)).toBeLessThan(0.002);
		expect(out.baselinePoints).toBe(nist.values.length);
		expect(out.baselineFrom).toEqual(at(0));
		expect(out.baselineTo).toEqual(at(nist.values.length - 1));
	});

	it('counts only points inside the period and not excluded, and records the exclusions used', () => {
		const exclusions = [
			{ key: 'run:2', reason: 'Wrong paste' },
			{ key: 'run:999', reason: 'Not shown any more' }
		];
		const out = baselineLimits(c, runs(nist.values), exclusions, { baselineTo: at(9) }, 5);
		expect(out.baselinePoints).toBe(9);
		expect(out.excluded).toEqual([{ key: 'run:2', reason: 'Wrong paste' }]);
	});

	it('refuses too few subgroups, naming how many were left out', () => {
		const exclusions = [{ key: 'run:1', reason: 'Setup board' }];
		const n = nist.values.length;
		expect(() => baselineLimits(c, runs(nist.values), exclusions, {}, 20)).toThrow(
			`The baseline has ${n - 1} subgroups (1 left out: excluded or outside the period); at least 20`
		);
	});

	it('refuses zero variation and unchartable data with LimitsError on the baseline field', () => {
		const flat = () => baselineLimits(c, runs([3, 3, 3, 3]), [], {}, 2);
		expect(flat).toThrow(LimitsError);
		expect(flat).toThrow('Zero variation');
		try {
			baselineLimits(c, runs([3]), [], {}, 1);
			expect.unreachable();
		} catch (e) {
			expect(e).toBeInstanceOf(LimitsError);
			expect((e as LimitsError).field).toBe('baseline');
		}
	});
});

describe('exclusionReason and the baseline setting', () => {
	it('needs a reason and a chart point key', () => {
		expect(exclusionReason('board:12', '  Clamp slipped ')).toBe('Clamp slipped');
		expect(() => exclusionReason('board:12', '  ')).toThrow('Say why');
		expect(() => exclusionReason('board:x', 'why')).toThrow('is not a point of this chart');
	});

	it('accepts whole numbers from 10 to 200 only', () => {
		expect([10, 20, 200].every(isMinBaselineSubgroups)).toBe(true);
		expect([9, 201, 20.5, '20', null].some(isMinBaselineSubgroups)).toBe(false);
	});
});
