import { describe, it, expect } from 'vitest';
import { assessLotForRun } from './assess-lot-for-run';
import { DEFAULT_PASTE_HANDLING } from './paste-lot';
import type { PasteEvent } from './paste-events';

const T0 = Date.UTC(2026, 2, 2, 6, 0, 0); // 2026-03-02 06:00 UTC, fixed for every case
const at = (m: number) => new Date(T0 + m * 60_000).toISOString();
const lot = Object.freeze({ lotNumber: 'PL-7', expiresOn: '2026-03-31' });
const settings = DEFAULT_PASTE_HANDLING; // warm-up 240, on stencil 480, out of cold 1440 min

const codes = (events: PasteEvent[], minute: number, l = lot) => {
	const result = assessLotForRun(l, events, settings, at(minute));
	return { refuse: result.refuse.map((r) => r.code), warn: result.warn.map((r) => r.code) };
};

const out: PasteEvent[] = [{ event: 'out-of-cold-storage', at: at(0) }];
const onStencil: PasteEvent[] = [
	...out,
	{ event: 'opened', at: at(240) },
	{ event: 'on-stencil', at: at(250) }
];

describe('assessLotForRun boundaries (fixed timestamps)', () => {
	const cases: [string, PasteEvent[], number, string[], string[]][] = [
		['never out of cold storage', [], 0, [], ['never-out-of-cold-storage']],
		['warming, 1 min before warm-up end', out, 239, [], ['warming-up']],
		['exactly at warm-up end', out, 240, [], []],
		['on stencil exactly 480 min', onStencil, 250 + 480, [], []],
		// Issue 13: past its time on the stencil blocks the run (an engineer may override).
		['on stencil 481 min', onStencil, 250 + 481, ['over-time-on-stencil'], []],
		['out of cold exactly 1440 min', onStencil.slice(0, 2), 1440, [], []],
		['out of cold 1441 min', onStencil.slice(0, 2), 1441, [], ['over-time-out-of-cold']],
		['both limits over', onStencil, 1441, ['over-time-on-stencil'], ['over-time-out-of-cold']],
		['discarded', [...out, { event: 'discarded', at: at(10) }], 20, ['discarded'], []],
		[
			'returned sealed',
			[...out, { event: 'returned', at: at(60) }],
			120,
			[],
			['back-in-cold-storage']
		],
		[
			'events after the run time are ignored',
			[...out, { event: 'discarded', at: at(500) }],
			300,
			[],
			[]
		]
	];
	it.each(cases)('%s', (_name, events, minute, refuse, warn) => {
		expect(codes(events, minute)).toEqual({ refuse, warn });
	});

	it('counts time out of cold storage across a return (30 + 1411 > 1440)', () => {
		const events: PasteEvent[] = [
			{ event: 'out-of-cold-storage', at: at(0) },
			{ event: 'returned', at: at(30) },
			{ event: 'out-of-cold-storage', at: at(1000) }
		];
		expect(codes(events, 1000 + 1410).warn).toEqual([]);
		expect(codes(events, 1000 + 1411).warn).toEqual(['over-time-out-of-cold']);
	});
});

describe('assessLotForRun expiry', () => {
	const cases: [string, string, string, string[]][] = [
		['last minute of the expiry day', '2026-03-31', '2026-03-31T23:59:00Z', []],
		['first instant after it', '2026-03-31', '2026-04-01T00:00:00Z', ['expired']],
		['timestamp expiry, 1 ms before', '2026-03-31T18:00:00Z', '2026-03-31T17:59:59.999Z', []],
		['timestamp expiry, exactly at it', '2026-03-31T18:00:00Z', '2026-03-31T18:00:00Z', ['expired']]
	];
	it.each(cases)('%s', (_name, expiresOn, when, refuse) => {
		const events: PasteEvent[] = [{ event: 'out-of-cold-storage', at: '2026-03-31T12:00:00Z' }];
		const result = assessLotForRun({ lotNumber: 'PL-7', expiresOn }, events, settings, when);
		expect(result.refuse.map((r) => r.code)).toEqual(refuse);
	});

	it('refuses an unreadable expiry instead of crashing', () => {
		const result = assessLotForRun(
			{ lotNumber: 'PL-8', expiresOn: '31/03/2026' },
			out,
			settings,
			at(300)
		);
		expect(result.refuse).toEqual([
			{
				code: 'invalid-lot',
				message: 'paste lot PL-8 has no readable expiry date (got "31/03/2026")'
			}
		]);
	});

	it('expired and over-time refusals may be overridden by an engineer; discarded and unreadable may not', () => {
		const expired = assessLotForRun(
			{ lotNumber: 'PL-9', expiresOn: '2026-03-01' },
			onStencil,
			settings,
			at(250 + 481)
		);
		expect(expired.refuse.map((r) => [r.code, r.canOverride ?? false])).toEqual([
			['expired', true],
			['over-time-on-stencil', true]
		]);
		const gone = assessLotForRun(
			{ lotNumber: 'PL-9', expiresOn: '2026-03-31' },
			[...out, { event: 'discarded', at: at(5) }],
			settings,
			at(10)
		);
		expect(gone.refuse.map((r) => r.canOverride ?? false)).toEqual([false]);
	});

	it('an expired and discarded lot gives both refusals', () => {
		const result = assessLotForRun(
			{ lotNumber: 'PL-9', expiresOn: '2026-03-01' },
			[...out, { event: 'discarded', at: at(5) }],
			settings,
			at(10)
		);
		expect(result.refuse.map((r) => r.code)).toEqual(['expired', 'discarded']);
	});
});

describe('assessLotForRun messages and bad input', () => {
	it('words the warm-up warning with elapsed and required time', () => {
		const result = assessLotForRun(lot, out, settings, at(90));
		expect(result.warn[0].message).toBe(
			'paste lot PL-7 is still warming up: 1 h 30 min of 4 h since it left cold storage'
		);
	});
	it('refuses an inconsistent log with the field of the bad event', () => {
		const result = assessLotForRun(lot, [{ event: 'opened', at: at(0) }], settings, at(10));
		expect(result.refuse[0].code).toBe('invalid-history');
		expect(result.refuse[0].message).toMatch(/events\[0\]\.event: 'opened' refused/);
	});
	it('throws a field error for an unreadable run time', () => {
		expect(() => assessLotForRun(lot, out, settings, 'now')).toThrow(/^at: must be an ISO 8601/);
	});
	it('throws a field error for a bad setting', () => {
		expect(() =>
			assessLotForRun(lot, out, { ...settings, warmUpMinutes: Number.NaN }, at(0))
		).toThrow('settings.warmUpMinutes: must be a number of minutes > 0 (got NaN)');
	});
});
