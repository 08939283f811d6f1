import { describe, expect, it } from 'vitest';
import { machineEventWords } from './event-words';

describe('machine event words', () => {
	it('words the events the CFX store keeps (detail as stored by store.ts)', () => {
		expect(
			machineEventWords('stencil-changed', { oldName: 'ST-GOOD', newName: 'ST-WORN' })
		).toEqual({
			title: 'Stencil changed',
			detail: 'ST-GOOD → ST-WORN',
			tone: 'info'
		});
		expect(
			machineEventWords('stencil-cleaned', {
				stencil: 'ST-PB100-T',
				known: true,
				mode: 'WVD',
				cyclesSinceLastClean: 10,
				durationMs: 35_000
			})
		).toEqual({
			title: 'Stencil cleaned',
			detail: 'ST-PB100-T · mode WVD · 10 prints since the last clean · 35 s',
			tone: 'ok'
		});
		expect(
			machineEventWords('fault', {
				faultId: 'f1',
				code: 'SIM-PASTE-LOW',
				cause: 'MechanicalFailure',
				severity: 'Error',
				description: null
			})
		).toEqual({
			title: 'Fault',
			detail: 'SIM-PASTE-LOW · MechanicalFailure · severity Error',
			tone: 'fault'
		});
		expect(
			machineEventWords('work-completed', { transactionId: 't', result: 'Completed', units: 1 })
		).toEqual({
			title: 'Work completed',
			detail: '1 board · result Completed',
			tone: 'info'
		});
		expect(machineEventWords('work-completed', { result: 'Failed', units: 2 }).tone).toBe('fault');
		expect(machineEventWords('squeegee-changed', { oldName: null, newName: 'SQ-300' }).detail).toBe(
			'— → SQ-300'
		);
	});

	it('shows unknown kinds and hostile values bounded, never throws', () => {
		const w = machineEventWords('lane-jam', { lane: 2, note: 'x'.repeat(5000), nested: { a: 1 } });
		expect(w.title).toBe('lane jam');
		expect(w.detail.length).toBeLessThan(300);
		expect(w.detail).toContain('lane: 2');
		expect(machineEventWords('fault', null as unknown as Record<string, unknown>).title).toBe(
			'Fault'
		);
	});
});
