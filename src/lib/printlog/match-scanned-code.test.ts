import { describe, it, expect } from 'vitest';
import { matchScannedCode, normaliseScannedCode } from './match-scanned-code';

const stencils = Object.freeze([
	{ code: 'ST-0007', label: 'Stencil ST-0007 (BRD-100 top)' },
	{ code: 'ST-0008', label: 'Stencil ST-0008 (BRD-100 bottom)' },
	{ code: 'ST-0107', label: 'Stencil ST-0107 (BRD-200 top)' },
	{ code: 'PL-2026-0042', label: 'Paste lot PL-2026-0042' }
]);

describe('normaliseScannedCode', () => {
	// AIM identifiers (ISO/IEC 15424, from memory): ]C1 GS1-128, ]E0 EAN-13, ]Q1 QR, ]d2 GS1 DataMatrix.
	const cases: [string, string][] = [
		['st-0007', 'ST-0007'],
		['  ST-0007\r\n', 'ST-0007'],
		[']C1ST-0007', 'ST-0007'],
		[']Q1st-0007', 'ST-0007'],
		[']d2ST-0007', 'ST-0007'],
		[' ]E0 4006381333931', '4006381333931'],
		['ST-0007]C1', 'ST-0007]C1'],
		['', '']
	];
	it.each(cases)('%j → %j', (raw, expected) => expect(normaliseScannedCode(raw)).toBe(expected));
});

describe('matchScannedCode', () => {
	const cases: [string, string | null, string[]][] = [
		['ST-0007', 'ST-0007', []],
		[' ]C1st-0007 ', 'ST-0007', []],
		['pl-2026-0042', 'PL-2026-0042', []],
		// One digit off: ST-0009 is 1 edit from ST-0007 and ST-0008, 2 from ST-0107.
		['ST-0009', null, ['ST-0007', 'ST-0008', 'ST-0107']],
		// A partial scan contained in a longer code.
		['0042', null, ['PL-2026-0042']],
		['XYZ-9999', null, []],
		['', null, []]
	];
	it.each(cases)('%j → %s', (scan, match, suggestions) => {
		const result = matchScannedCode(scan, stencils);
		expect(result.match?.code ?? null).toBe(match);
		expect(result.suggestions.map((s) => s.code)).toEqual(suggestions);
	});

	it('limits suggestions', () => {
		expect(matchScannedCode('ST-0009', stencils, 1).suggestions).toHaveLength(1);
	});
	it('handles no candidates', () => {
		expect(matchScannedCode('ST-0007', [])).toEqual({ match: null, suggestions: [] });
	});
});
