import { describe, expect, it } from 'vitest';
import { REQUIRED_FIELDS } from './canonical-fields';
import { createIssueCollector, formatIngestIssue } from './ingest-issue';
import { CANONICAL_PROFILE } from './mapping-profile';
import { requiredFieldsFor, resolveHeader } from './resolve-header';

describe('requiredFieldsFor', () => {
	it.each([
		['canonical', {}, [...REQUIRED_FIELDS]],
		[
			'serial from file name',
			{ serialFromFileName: { pattern: '(.*)' } },
			REQUIRED_FIELDS.filter((f) => f !== 'board_serial')
		],
		[
			'constants',
			{ constants: { line: 'L1', product: 'P', panelIndex: 0 } },
			REQUIRED_FIELDS.filter((f) => !['line', 'product', 'panel_index'].includes(f))
		],
		[
			'absolute volume',
			{ volumeMode: 'absolute-um3' as const },
			[...REQUIRED_FIELDS.filter((f) => f !== 'volume_pct'), 'volume_um3']
		]
	])('%s', (_name, change, expected) => {
		expect(requiredFieldsFor({ ...CANONICAL_PROFILE, ...change })).toEqual(expected);
	});
});

describe('resolveHeader', () => {
	it('finds columns trimmed and case-insensitive, in any order', () => {
		const header = [' RESULT ', ...REQUIRED_FIELDS.slice(0, -1).reverse(), 'Stencil'];
		const r = resolveHeader(header, CANONICAL_PROFILE);
		expect(r.errors).toEqual([]);
		expect(r.warnings).toEqual([]);
		expect(r.indices.result).toBe(0);
		expect(r.indices.board_serial).toBe(12);
		expect(r.indices.stencil).toBe(13);
		expect(r.indices.print_run).toBe(-1);
		expect(r.names[0]).toBe('RESULT');
	});

	it('warns about a nameless column (trailing delimiter)', () => {
		const r = resolveHeader([...REQUIRED_FIELDS, ''], CANONICAL_PROFILE);
		expect(r.warnings).toEqual([{ row: 1, column: '', message: 'column 14 has no name; ignored' }]);
	});

	it('only refdes present → every other required column missing, in canonical order', () => {
		const r = resolveHeader(['refdes'], CANONICAL_PROFILE);
		expect(r.errors.map((e) => e.column)).toEqual(REQUIRED_FIELDS.filter((f) => f !== 'refdes'));
	});
});

describe('ingest issues', () => {
	it.each([
		[{ row: 0, column: null, message: 'file is empty' }, 'row 0: file is empty'],
		[
			{ row: 7, column: 'height_um', message: 'height_um 2500 is outside 0 to 2000 µm' },
			'row 7, column "height_um": height_um 2500 is outside 0 to 2000 µm'
		]
	])('formats %j', (issue, text) => {
		expect(formatIngestIssue(issue)).toBe(text);
	});

	it('keeps the first `limit` issues and counts all', () => {
		const c = createIssueCollector(2);
		for (let i = 1; i <= 5; i++) c.add({ row: i, column: null, message: 'x' });
		expect(c.count).toBe(5);
		expect(c.list().map((i) => i.row)).toEqual([1, 2]);
	});

	it('limit 0 keeps none; a bad limit throws', () => {
		const c = createIssueCollector(0);
		c.add({ row: 1, column: null, message: 'x' });
		expect([c.count, c.list().length]).toEqual([1, 0]);
		expect(() => createIssueCollector(-1)).toThrow(
			'createIssueCollector requires a non-negative integer limit, got -1'
		);
	});
});
