import { describe, expect, it } from 'vitest';
import { REQUIRED_FIELDS } from './canonical-fields';
import { suggestColumnMapping } from './suggest-column-mapping';

describe('suggestColumnMapping', () => {
	it('maps the canonical header onto itself with full confidence', () => {
		const s = suggestColumnMapping([...REQUIRED_FIELDS]);
		for (const f of REQUIRED_FIELDS) {
			expect(s.columns[f]).toBe(f);
			expect(s.confidence[f]).toBe(1);
		}
		expect(s.unmatched).toEqual([]);
	});

	it('maps the invented Example X1 layout (tests/fixtures/spi/example-x1.profile.json)', () => {
		const headers = [
			'Barcode',
			'Date',
			'Program',
			'Array',
			'Component',
			'Pin',
			'Volume(%)',
			'Area(%)',
			'Height(mm)',
			'X Shift(mm)',
			'Y Shift(mm)',
			'Judgement'
		];
		const s = suggestColumnMapping(headers);
		expect(s.columns).toEqual({
			board_serial: 'Barcode',
			inspected_at: 'Date',
			product: 'Program',
			panel_index: 'Array',
			refdes: 'Component',
			pad: 'Pin',
			volume_pct: 'Volume(%)',
			area_pct: 'Area(%)',
			height_um: 'Height(mm)',
			offset_x_um: 'X Shift(mm)',
			offset_y_um: 'Y Shift(mm)',
			result: 'Judgement'
		});
		expect(s.lengthUnitHint).toBe('mm');
		expect(s.unmatched).toEqual([]);
	});

	it.each([
		['Volume(%)', 'volume_pct'],
		['Vol %', 'volume_pct'],
		['Volume [µm³]', 'volume_um3'],
		['Volume (um3)', 'volume_um3'],
		['Serial Number', 'board_serial'],
		['Ref Des', 'refdes'],
		['Pass/Fail', 'result'],
		['Offset X (µm)', 'offset_x_um'],
		['Y-Offset', 'offset_y_um'],
		['Height', 'height_um'],
		['Stencil ID', 'stencil'],
		['Print Run', 'print_run'],
		['Inspection Time', 'inspected_at'],
		['Hieght', 'height_um'] // typo: bigram similarity still finds it
	])('%j → %s', (header, field) => {
		const s = suggestColumnMapping([header]);
		expect(Object.entries(s.columns)).toEqual([[field, header]]);
	});

	it('tells volume % from absolute volume when both are present', () => {
		const s = suggestColumnMapping(['Volume', 'Volume(µm³)']);
		expect(s.columns.volume_pct).toBe('Volume');
		expect(s.columns.volume_um3).toBe('Volume(µm³)');
	});

	it('gives each header to one field only and lists the rest as unmatched', () => {
		const s = suggestColumnMapping(['Operator', 'Remarks', 'Refdes', 'refdes copy']);
		expect(s.columns.refdes).toBe('Refdes');
		expect(s.unmatched).toEqual(expect.arrayContaining(['Operator', 'Remarks']));
		expect(Object.values(s.columns).filter((h) => h === 'Refdes')).toHaveLength(1);
	});

	it.each([
		[['Height (mil)'], 'mil'],
		[['Offset X [um]'], 'um'],
		[['Height'], null]
	])('length unit hint of %j is %s', (headers, unit) => {
		expect(suggestColumnMapping(headers).lengthUnitHint).toBe(unit);
	});

	it('empty input', () => {
		expect(suggestColumnMapping([])).toEqual({
			columns: {},
			confidence: {},
			unmatched: [],
			lengthUnitHint: null
		});
	});
});
