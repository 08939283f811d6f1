import { parameterLabel } from './run-changes';
import { describe, expect, it } from 'vitest';
import { describeRunChange, runChanges } from './run-changes';

const before = {
	id: 7,
	stencil: 'ST-PB100',
	stencilRevision: 'B',
	pasteLot: 'PL-2026-0412',
	bladeCode: null,
	boardSerial: null,
	startedAt: '2026-03-02T06:00:00.000Z',
	endedAt: '2026-03-02T08:00:00.000Z',
	boardsPrinted: 120,
	ambientTempC: 23,
	relativeHumidityPct: 45,
	parameters: { squeegeeSpeedMmS: 40, printStroke: 'alternating' },
	corrections: 0
};

describe('runChanges', () => {
	it('finds nothing between identical snapshots and ignores bookkeeping fields', () => {
		expect(runChanges(before, { ...before, corrections: 1, id: 8 })).toEqual([]);
	});

	it('lists changed identifiers, times and settings with their labels, in a stable order', () => {
		const after = {
			...before,
			stencil: 'ST-PB100-2',
			bladeCode: 'BL-300-07',
			boardSerial: 'FW-PB100-000123',
			endedAt: '2026-03-02T08:30:00.000Z',
			parameters: { squeegeeSpeedMmS: 40, printStroke: 'front-to-back', wipeMode: 'wet-dry' }
		};
		expect(runChanges(before, after)).toEqual([
			{ field: 'stencil', label: 'Stencil', from: 'ST-PB100', to: 'ST-PB100-2' },
			{ field: 'bladeCode', label: 'Blade', from: null, to: 'BL-300-07' },
			{ field: 'boardSerial', label: 'Board serial', from: null, to: 'FW-PB100-000123' },
			{
				field: 'endedAt',
				label: 'Ended',
				from: '2026-03-02T08:00:00.000Z',
				to: '2026-03-02T08:30:00.000Z'
			},
			{
				field: 'parameters.printStroke',
				label: 'Print stroke',
				from: 'alternating',
				to: 'front-to-back'
			},
			{ field: 'parameters.wipeMode', label: 'Wipe mode', from: null, to: 'wet-dry' }
		]);
	});

	it('treats blank, null and missing as the same "no value"', () => {
		expect(runChanges({ ...before, bladeCode: '' }, { ...before, bladeCode: undefined })).toEqual(
			[]
		);
	});

	it('reports a number changed to another number and to nothing', () => {
		const after = {
			...before,
			ambientTempC: null,
			parameters: { ...before.parameters, squeegeeSpeedMmS: 45 }
		};
		expect(runChanges(before, after).map(describeRunChange)).toEqual([
			'Ambient temperature: 23 → —',
			'Squeegee speed: 40 → 45'
		]);
	});
});

describe('parameterLabel (issue 13: words, not keys)', () => {
	it.each([
		['squeegeeSpeedMmS', 'Squeegee speed'],
		['squeegeePressureKg', 'Squeegee pressure'],
		['ambientTempC', 'Ambient temperature'],
		['someNewKeyMm', 'some new key mm']
	])('%s → %s', (key, label) => expect(parameterLabel(key)).toBe(label));
});
