import { describe, expect, it } from 'vitest';
import { widerScopeIds, type ScopeMember } from './ack-scope';

const member = (id: number, over: Partial<ScopeMember> = {}): ScopeMember => ({
	id,
	characteristicId: 1,
	runId: 10,
	side: 'top',
	...over
});

describe('widerScopeIds', () => {
	it('closes the open signals of the same characteristic, run and side', () => {
		const open = [
			member(10),
			member(11),
			member(12, { side: 'bottom' }),
			member(13, { side: null }),
			member(14, { runId: 20 }),
			member(15, { characteristicId: 2 })
		];
		expect(widerScopeIds(open[0], open)).toEqual([10, 11]);
	});

	it('a signal on the bottom side never closes the top side', () => {
		const open = [member(10), member(12, { side: 'bottom' }), member(16, { side: 'bottom' })];
		expect(widerScopeIds(open[1], open)).toEqual([12, 16]);
	});

	it('with the side unknown, the same characteristic and run (a chart is one product and lines)', () => {
		const open = [member(10, { side: null }), member(11), member(12, { side: 'bottom' })];
		expect(widerScopeIds(open[0], open)).toEqual([10, 11, 12]);
	});

	it('a signal alone in its run closes itself only; the signal itself is always included', () => {
		expect(widerScopeIds(member(5, { runId: null }), [member(5), member(6)])).toEqual([5]);
		expect(widerScopeIds(member(7), [member(8)])).toEqual([7, 8]);
	});
});
