import { describe, expect, it } from 'vitest';
import { CANONICAL_FIELDS } from './canonical-fields';
import { CANONICAL_PROFILE } from './mapping-profile';
import { mapSpiHeader, serialFromFileName } from './spi-field-map';

describe('mapSpiHeader', () => {
	it('finds every canonical column of the canonical layout', () => {
		const { header, columns } = mapSpiHeader([...CANONICAL_FIELDS], CANONICAL_PROFILE, false);
		expect(header.errors).toEqual([]);
		expect(columns.serial).toBe(0);
		expect(columns.offsetYUm).toBe(CANONICAL_FIELDS.indexOf('offset_y_um'));
		expect(columns.printRun).toBe(CANONICAL_FIELDS.indexOf('print_run'));
	});

	it('leaves out the columns the profile supplies otherwise', () => {
		const profile = {
			...CANONICAL_PROFILE,
			constants: { line: 'L1', product: 'P', panelIndex: 0 }
		};
		const { columns } = mapSpiHeader([...CANONICAL_FIELDS], profile, true);
		expect([columns.serial, columns.line, columns.product, columns.panel]).toEqual([
			-1, -1, -1, -1
		]);
	});

	it('reports a missing column through the header', () => {
		const { header, columns } = mapSpiHeader(['board_serial'], CANONICAL_PROFILE, false);
		expect(header.errors.length).toBeGreaterThan(0);
		expect(columns.refdes).toBe(-1);
	});
});

describe('serialFromFileName', () => {
	const profile = { ...CANONICAL_PROFILE, serialFromFileName: { pattern: '^(RB-\\d+)_' } };

	it('takes the serial from the base name', () => {
		expect(serialFromFileName(profile, 'in/RB-17_top.csv')).toEqual({
			serial: 'RB-17',
			error: null
		});
		expect(serialFromFileName(profile, 'C:\\in\\RB-18_top.csv').serial).toBe('RB-18');
	});

	it('is an error when the name does not match', () => {
		expect(serialFromFileName(profile, 'other.csv').error).toBe(
			'file name "other.csv" does not match the serial pattern /^(RB-\\d+)_/'
		);
	});

	it('is nothing when the profile reads a column', () => {
		expect(serialFromFileName(CANONICAL_PROFILE, 'x.csv')).toEqual({ serial: null, error: null });
	});
});
