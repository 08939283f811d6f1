import { describe, it, expect } from 'vitest';
import ref from '../../../reference/printlog/check-values.json';
import { formatFieldError } from './field-error';
import {
	DEFAULT_PASTE_HANDLING,
	lotDateWarnings,
	FLUX_CLASS_PATTERN,
	lotExpiresAtMs,
	resolvePasteHandling,
	validatePasteLot
} from './paste-lot';

/** Fictional lot from an invented supplier. */
const lot = Object.freeze({
	lotNumber: 'PL-2026-0042',
	alloy: 'SAC305',
	powderType: 4,
	fluxClass: 'ROL0',
	containerGrams: 500,
	receivedOn: '2026-01-15',
	expiresOn: '2026-06-30'
});

describe('DEFAULT_PASTE_HANDLING', () => {
	it('uses the common-practice figures recorded in the reference file', () => {
		expect(DEFAULT_PASTE_HANDLING).toEqual({
			warmUpMinutes: ref.pasteHandling.warmUpMinutes.value,
			maxOnStencilMinutes: ref.pasteHandling.maxOnStencilMinutes.value,
			maxOutOfColdMinutes: ref.pasteHandling.maxOutOfColdMinutes.value
		});
		const [low, high] = ref.pasteHandling.maxOnStencilMinutes.range;
		expect(DEFAULT_PASTE_HANDLING.maxOnStencilMinutes).toBeGreaterThanOrEqual(low);
		expect(DEFAULT_PASTE_HANDLING.maxOnStencilMinutes).toBeLessThanOrEqual(high);
	});
});

describe('resolvePasteHandling', () => {
	const cases: [string, Record<string, unknown>, string[]][] = [
		['no overrides', {}, []],
		['data-sheet values', { warmUpMinutes: 120, maxOnStencilMinutes: 240 }, []],
		[
			'zero',
			{ warmUpMinutes: 0 },
			['warmUpMinutes: must be a whole number of minutes from 1 to 2880 (got 0)']
		],
		[
			'fractional',
			{ maxOnStencilMinutes: 7.5 },
			['maxOnStencilMinutes: must be a whole number of minutes from 1 to 4320 (got 7.5)']
		],
		[
			'string',
			{ maxOutOfColdMinutes: '24h' },
			['maxOutOfColdMinutes: must be a whole number of minutes from 1 to 43200 (got "24h")']
		],
		[
			'warm-up ≥ out-of-cold',
			{ warmUpMinutes: 600, maxOutOfColdMinutes: 600 },
			['warmUpMinutes: must be shorter than maxOutOfColdMinutes (600)']
		]
	];
	it.each(cases)('%s', (_name, overrides, expected) => {
		expect(resolvePasteHandling(overrides).errors.map(formatFieldError)).toEqual(expected);
	});
	it('keeps defaults for fields not overridden', () => {
		expect(resolvePasteHandling({ warmUpMinutes: 120 }).settings).toEqual({
			...DEFAULT_PASTE_HANDLING,
			warmUpMinutes: 120
		});
	});
});

describe('FLUX_CLASS_PATTERN (J-STD-004 style, from memory)', () => {
	const cases: [string, boolean][] = [
		['ROL0', true],
		['REL0', true],
		['ORM1', true],
		['INH1', true],
		['rol1', true],
		['ROL2', false],
		['RXL0', false],
		['ROLO', false],
		['L0', false],
		['ROL01', false]
	];
	it.each(cases)('%s → %s', (text, ok) => {
		expect(FLUX_CLASS_PATTERN.test(text)).toBe(ok);
	});
});

describe('validatePasteLot', () => {
	it('accepts a complete lot', () => {
		expect(validatePasteLot(lot)).toEqual([]);
	});

	const cases: [string, Record<string, unknown>, string][] = [
		['blank lot number', { lotNumber: '  ' }, 'lotNumber: must not be blank (got "  ")'],
		[
			'powder type 0',
			{ powderType: 0 },
			'powderType: must be a J-STD-005 type, a whole number 1–8 (got 0)'
		],
		[
			'powder type 9',
			{ powderType: 9 },
			'powderType: must be a J-STD-005 type, a whole number 1–8 (got 9)'
		],
		[
			'powder type 4.5',
			{ powderType: 4.5 },
			'powderType: must be a J-STD-005 type, a whole number 1–8 (got 4.5)'
		],
		[
			'bad flux',
			{ fluxClass: 'ROL5' },
			'fluxClass: must be a J-STD-004 class: RO/RE/OR/IN + L/M/H + 0/1, e.g. ROL0 (got "ROL5")'
		],
		[
			'negative grams',
			{ containerGrams: -500 },
			'containerGrams: must be a number of grams > 0 (got -500)'
		],
		[
			'missing expiry',
			{ expiresOn: undefined },
			'expiresOn: is required: an ISO date such as 2026-06-30'
		],
		[
			'31 February',
			{ expiresOn: '2026-02-31' },
			'expiresOn: must be an ISO date such as 2026-06-30 (got "2026-02-31")'
		],
		[
			'received after expiry',
			{ receivedOn: '2026-07-01' },
			'expiresOn: must not be before receivedOn (2026-07-01)'
		],
		[
			'empty alloy',
			{ alloy: '' },
			'alloy: must be an alloy designation such as SAC305 or Sn63Pb37 (got "")'
		]
	];
	it.each(cases)('%s', (_name, change, expected) => {
		expect(validatePasteLot({ ...lot, ...change }).map(formatFieldError)).toEqual([expected]);
	});

	it('powder types 1 and 8 are the J-STD-005 boundaries', () => {
		expect(validatePasteLot({ ...lot, powderType: ref.powderTypes.min })).toEqual([]);
		expect(validatePasteLot({ ...lot, powderType: ref.powderTypes.max })).toEqual([]);
	});

	it('survives an empty object', () => {
		expect(validatePasteLot({}).map((e) => e.field)).toEqual([
			'lotNumber',
			'alloy',
			'powderType',
			'expiresOn'
		]);
	});
});

describe('lotExpiresAtMs', () => {
	it('a bare date is usable through that UTC day', () => {
		expect(lotExpiresAtMs('2026-06-30')).toBe(Date.UTC(2026, 6, 1));
	});
	it('a date-time with zone is the expiry instant', () => {
		expect(lotExpiresAtMs('2026-06-30T12:00:00+02:00')).toBe(Date.UTC(2026, 5, 30, 10));
	});
	it.each([['30.06.2026'], ['2026-06-30T12:00:00'], ['']])(
		'refuses %j naming expiresOn',
		(text) => {
			expect(() => lotExpiresAtMs(text)).toThrow(/^expiresOn: must be an ISO 8601 date/);
		}
	);
});

describe('lotDateWarnings (issue 13: dates to confirm at receipt)', () => {
	const now = Date.parse('2026-12-03T10:00:00Z');
	it.each([
		['expiry in 2020, already past', { expiresOn: '2020-06-30' }, ['expiresOn']],
		['expired yesterday', { expiresOn: '2026-12-02' }, ['expiresOn']],
		['last day of use is today: still usable', { expiresOn: '2026-12-03' }, []],
		['six months ahead', { expiresOn: '2027-06-03', receivedOn: '2026-12-01' }, []],
		['more than 2 years ahead', { expiresOn: '2029-01-15' }, ['expiresOn']],
		[
			'received in the future',
			{ expiresOn: '2027-06-03', receivedOn: '2026-12-20' },
			['receivedOn']
		],
		['received in 2020', { expiresOn: '2027-06-03', receivedOn: '2020-01-10' }, ['receivedOn']],
		['unreadable dates are validatePasteLot errors, not warnings', { expiresOn: '31/12/2027' }, []]
	])('%s', (_name, lot, fields) => {
		expect(lotDateWarnings(lot, now).map((w) => w.field)).toEqual(fields);
	});
	it('says why', () => {
		expect(lotDateWarnings({ expiresOn: '2020-06-30' }, now)[0].message).toBe(
			'the lot expired on 2020-06-30, before today (2026-12-03): it may not be used'
		);
	});
});
