import { describe, expect, it } from 'vitest';
import {
	characteristicInputSchema,
	characteristicUnit,
	characteristicValues,
	checkCharacteristic
} from './characteristic-input';
import { CHARTABLE_PARAMETERS } from './chart-measures';

const base = characteristicInputSchema.parse({
	name: 'PB-100 volume',
	productId: 1,
	lineIds: [3, 1, 3],
	measure: 'volume-pct',
	chartKind: 'xbar-r',
	rules: ['we-1', 'we-1', 'we-2']
});

describe('checkCharacteristic', () => {
	it('accepts a plain SPI characteristic', () => {
		expect(checkCharacteristic(base, CHARTABLE_PARAMETERS)).toEqual([]);
	});
	it('names LSL at or above USL, an unknown parameter and a chart that cannot be formed', () => {
		const fields = checkCharacteristic(
			{ ...base, measure: 'print-parameter', parameterKey: 'nope', chartKind: 'between-within' },
			CHARTABLE_PARAMETERS
		).map((p) => p.field);
		expect(fields).toEqual(['parameterKey', 'chartKind']);
		expect(checkCharacteristic({ ...base, lsl: 5, usl: 5 }, CHARTABLE_PARAMETERS)).toEqual([
			{ field: 'lsl', message: 'LSL 5 must be below USL 5' }
		]);
		expect(
			checkCharacteristic(
				{ ...base, subgroupMode: 'consecutive', subgroupSize: 1, chartKind: 'xbar-r' },
				CHARTABLE_PARAMETERS
			)
		).toEqual([{ field: 'subgroupSize', message: 'X̄/R needs subgroups of 2 to 10' }]);
	});
});

describe('characteristicValues', () => {
	it("fills specs not given from the measure's defaults; an explicit null clears one", () => {
		const v = characteristicValues({ ...base, usl: null });
		expect([v.lsl, v.target, v.usl]).toEqual([50, 100, null]);
		expect(v.unit).toBe('%');
	});
	it('keeps lines sorted without repeats, rules without repeats, one value per board point', () => {
		const v = characteristicValues({ ...base, subgroupSize: 5 });
		expect(v.lineIds).toEqual([1, 3]);
		expect(v.rules).toEqual(['we-1', 'we-2']);
		expect(v.subgroupSize).toBe(1);
		expect(v.parameterKey).toBeNull();
	});
	it('stores open area-ratio bounds as null', () => {
		const v = characteristicValues({ ...base, padSelection: { kind: 'area-ratio', min: 0.6 } });
		expect(v.padSelection).toEqual({ kind: 'area-ratio', min: 0.6, max: null });
	});
});

describe('characteristicUnit', () => {
	it("takes the given unit, else the parameter's suffix, else the measure's", () => {
		expect(characteristicUnit({ ...base, unit: 'pct' })).toBe('pct');
		expect(
			characteristicUnit({ ...base, measure: 'print-parameter', parameterKey: 'squeegeeSpeedMmS' })
		).toBe('mm/s');
		expect(characteristicUnit({ ...base, measure: 'height-um' })).toBe('µm');
	});
});
