import { describe, expect, it } from 'vitest';
import { CANONICAL_FIELDS, FIELD_RANGES } from '../ingest/canonical-fields';
import {
	PAD_MEASURE_KEYS,
	PAD_MEASURE_RANGES,
	PAD_MEASURES,
	SPI_MEASURE_IDS,
	SPI_MEASURES,
	spiMeasureById
} from './measures';

describe('SPI measure catalogue', () => {
	it('names each measure once, in every spelling', () => {
		for (const spelling of ['id', 'key', 'column', 'label'] as const) {
			const names = SPI_MEASURES.map((m) => m[spelling]);
			expect(new Set(names).size, spelling).toBe(names.length);
		}
	});

	it('spells the key as the camel case of the SQL column prefix', () => {
		for (const m of SPI_MEASURES)
			expect(m.column.replace(/_([a-z])/g, (_, c: string) => c.toUpperCase())).toBe(m.key);
	});

	it('has the pad measures of the canonical layout, in its order', () => {
		const fields = PAD_MEASURES.map((m) => m.field);
		const inLayout = CANONICAL_FIELDS.filter((f) => (fields as readonly string[]).includes(f));
		expect(inLayout).toEqual(fields);
		expect(PAD_MEASURE_KEYS).toEqual([
			'volumePct',
			'areaPct',
			'heightUm',
			'offsetXUm',
			'offsetYUm'
		]);
	});

	it('gives the parser its plausibility ranges (REFERENCE-FACTS §e: 100 % nominal, 50–150 % specs)', () => {
		expect(PAD_MEASURE_RANGES.volume_pct).toEqual({ min: 0, max: 1000 });
		expect(FIELD_RANGES.offset_y_um).toEqual({ min: -5000, max: 5000 });
		for (const m of PAD_MEASURES) {
			const { lsl, usl } = m.defaults;
			if (lsl !== null) expect(lsl).toBeGreaterThanOrEqual(m.range.min);
			if (usl !== null) expect(usl).toBeLessThanOrEqual(m.range.max);
		}
	});

	it('stores pad values in hundredths and charts transfer efficiency (a fraction) in %', () => {
		expect(PAD_MEASURES.every((m) => m.padColumn.includes('_centi_') && m.decimals === 2)).toBe(
			true
		);
		expect(spiMeasureById('transfer-efficiency-pct')).toMatchObject({
			padColumn: null,
			chartScale: 100,
			unit: '%'
		});
		expect(spiMeasureById('print-parameter')).toBeUndefined();
		expect(SPI_MEASURE_IDS).toContain('offset-x-um');
	});
});
