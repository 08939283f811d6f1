import { describe, expect, it } from 'vitest';
import { CANONICAL_FIELDS } from './canonical-fields';
import { createIssueCollector } from './ingest-issue';
import { CANONICAL_PROFILE, type MappingProfile } from './mapping-profile';
import { createTimestampParser } from './parse-timestamp';
import { mapSpiHeader } from './spi-field-map';
import {
	createRowValidator,
	emptyCheckedRow,
	quoteCell,
	readIndex,
	trimSpaces
} from './spi-row-validation';
import type { SpiCells } from './spi-tokenizer';

/** The cells of a comma-separated record. */
function cellsOf(record: string): SpiCells {
	const parts = record.split(',');
	const starts = new Int32Array(parts.length);
	const ends = new Int32Array(parts.length);
	let at = 0;
	parts.forEach((p, i) => {
		starts[i] = at;
		ends[i] = at + p.length;
		at += p.length + 1;
	});
	return { text: record, starts, ends, count: parts.length };
}

function validator(profile: MappingProfile = CANONICAL_PROFILE) {
	const names = [...CANONICAL_FIELDS];
	const errors = createIssueCollector(100);
	const v = createRowValidator({
		profile,
		names,
		columns: mapSpiHeader(names, profile, false).columns,
		serialFromName: null,
		parseTime: createTimestampParser(profile.timestampFormat, profile.timeZone),
		errors,
		issueLimit: 100
	});
	return { v, errors };
}

const GOOD = 'RB-1,2026-03-02T08:00:00Z,L1,PB-100,2,C1,1,101.5,99,120,-5,3.5,warn,,ST-7,';

describe('createRowValidator', () => {
	it('fills a checked row in canonical units', () => {
		const { v, errors } = validator({ ...CANONICAL_PROFILE, lengthUnit: 'mm' });
		const row = emptyCheckedRow();
		expect(v.check(cellsOf(GOOD.replace(',120,-5,3.5,', ',0.12,-0.005,0.0035,')), 7, row)).toBe(
			true
		);
		expect(errors.list()).toEqual([]);
		expect(row).toMatchObject({
			line: 7,
			boardSerial: 'RB-1',
			inspectedAtMs: Date.UTC(2026, 2, 2, 8),
			panelIndex: 2,
			volumePct: 101.5,
			result: 1,
			stencil: 'ST-7',
			printRun: ''
		});
		expect(row.heightUm).toBeCloseTo(120, 9);
		expect(row.offsetXUm).toBeCloseTo(-5, 9);
		expect(Number.isNaN(row.volumeUm3)).toBe(true);
	});

	it('reports every bad cell of a row by line, column and field', () => {
		const { v, errors } = validator();
		const bad = 'RB-1,yesterday,L1,PB-100,x,C1,1,0x10,99,2500,-5,3.5,maybe,,,';
		expect(v.check(cellsOf(bad), 4, emptyCheckedRow())).toBe(false);
		expect(errors.list()).toEqual([
			{
				row: 4,
				column: 'inspected_at',
				message: 'inspected_at is not a timestamp in format iso: "yesterday"'
			},
			{ row: 4, column: 'panel_index', message: 'panel_index must be an integer 0 to 65535: "x"' },
			{ row: 4, column: 'volume_pct', message: 'volume_pct is not a number: "0x10"' },
			{ row: 4, column: 'height_um', message: 'height_um 2500 is outside 0 to 2000 µm' },
			{
				row: 4,
				column: 'result',
				message: 'unknown result "maybe" (expected one of: pass, warn, fail)'
			}
		]);
	});

	it('reuses a repeated cell value and still checks a changed one', () => {
		const { v } = validator();
		const first = emptyCheckedRow();
		v.check(cellsOf(GOOD), 2, first);
		const serial = first.boardSerial;
		const second = emptyCheckedRow();
		v.check(cellsOf(GOOD), 3, second);
		expect(second.boardSerial).toBe(serial);
		expect(v.check(cellsOf(GOOD.replace('L1', '')), 4, emptyCheckedRow())).toBe(false);
	});
});

describe('cell helpers', () => {
	it('quoteCell spells invisible characters and cuts long cells', () => {
		expect(quoteCell('\u00a012\t')).toBe('"\\u00A012\\u0009"');
		expect(quoteCell('x'.repeat(61))).toBe(`"${'x'.repeat(60)}…"`);
	});

	it('readIndex takes 1–5 plain digits with spaces around, else NaN', () => {
		expect(readIndex(' 42 ', 0, 4)).toBe(42);
		expect(readIndex('123456', 0, 6)).toBeNaN();
		expect(readIndex('4.0', 0, 3)).toBeNaN();
		expect(readIndex('', 0, 0)).toBeNaN();
	});

	it('trimSpaces trims ASCII spaces only', () => {
		expect(trimSpaces('  1 ')).toBe('1');
		expect(trimSpaces('\u00a01')).toBe('\u00a01');
	});
});
