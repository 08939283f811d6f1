import { describe, it, expect } from 'vitest';
import { createWedgeBuffer, scanFieldValue } from './barcode-wedge';

/** Feed [key, ms] pairs and collect what each key returns. */
function feed(keys: [string, number][], options = { maxInterKeyMs: 50, minLength: 3 }) {
	const wedge = createWedgeBuffer(options);
	return keys.map(([key, ms]) => wedge.key(key, ms)).filter((r) => r !== null);
}

/** Keys of `text` starting at `startMs`, `gapMs` apart, then Enter after `enterGapMs`. */
function burst(
	text: string,
	startMs: number,
	gapMs: number,
	enterGapMs = gapMs
): [string, number][] {
	const keys: [string, number][] = [...text].map((c, i) => [c, startMs + i * gapMs]);
	return [...keys, ['Enter', startMs + (text.length - 1) * gapMs + enterGapMs]];
}

describe('createWedgeBuffer timing', () => {
	const cases: [string, [string, number][], string[]][] = [
		['scanner, 8 ms apart', burst('ST-0007', 1000, 8), ['ST-0007']],
		['gaps exactly 50 ms are fast', burst('PL7', 1000, 50), ['PL7']],
		['gaps 51 ms are typing', burst('PL7', 1000, 51), []],
		['fast keys, slow Enter', burst('PL7', 1000, 10, 51), []],
		['too short: 2 characters', burst('P7', 1000, 5), []],
		['exactly minLength', burst('P77', 1000, 5), ['P77']],
		['empty Enter', [['Enter', 1000]], []],
		['typed then scanned', [['x', 0], ['y', 400], ...burst('ABC123', 2000, 5)], ['ABC123']],
		['two scans in a row', [...burst('AAA', 0, 5), ...burst('BBB', 1000, 5)], ['AAA', 'BBB']],
		[
			'Shift keys do not break a burst',
			[
				['Shift', 0],
				['P', 2],
				['Shift', 4],
				['L', 6],
				['7', 8],
				['Enter', 10]
			],
			['PL7']
		],
		[
			'clock going backwards breaks the burst',
			[
				['A', 100],
				['B', 105],
				['C', 90],
				['Enter', 95]
			],
			[]
		],
		[
			'NaN time breaks the burst',
			[
				['A', 0],
				['B', Number.NaN],
				['C', 5],
				['Enter', 10]
			],
			[]
		]
	];
	it.each(cases)('%s', (_name, keys, scans) => {
		expect(feed(keys)).toEqual(scans);
	});

	it('accepts Tab as terminator when configured', () => {
		const wedge = createWedgeBuffer({ terminators: ['Tab'] });
		expect(['A', 'B', 'C', 'Tab'].map((k, i) => wedge.key(k, i * 5))).toEqual([
			null,
			null,
			null,
			'ABC'
		]);
	});

	it('reset drops a burst', () => {
		const wedge = createWedgeBuffer();
		wedge.key('A', 0);
		wedge.key('B', 5);
		wedge.key('C', 10);
		expect(wedge.pending).toBe('ABC');
		wedge.reset();
		expect(wedge.key('Enter', 12)).toBeNull();
	});

	it.each([
		[{ maxInterKeyMs: 0 }, /maxInterKeyMs: must be a number of milliseconds > 0 \(got 0\)/],
		[{ maxInterKeyMs: Number.NaN }, /got NaN/],
		[{ minLength: 0 }, /minLength: must be a whole number ≥ 1 \(got 0\)/],
		[{ minLength: 2.5 }, /got 2.5/]
	])('refuses options %j', (options, message) => {
		expect(() => createWedgeBuffer(options)).toThrow(message);
	});
});

describe('scanFieldValue', () => {
	const cases: [string, string, string | null, string, string][] = [
		// value after the keys, value when the field got focus, last fast burst → field value
		['ST-AST-B', 'ST-A', 'ST-B', 'ST-B', 'a scan appended to an earlier code replaces it'],
		['ST-AST-B', 'ST-A', 'T-B', 'ST-B', 'a stalled scan appended to an earlier code, whole'],
		['st-pb100', '', 'b100', 'st-pb100', 'a scan into an empty field split by a stall stays whole'],
		['ST-B', 'ST-A', 'ST-B', 'ST-B', 'the old code was selected and replaced by the scan'],
		['ST-A', 'ST-A', null, 'ST-A', 'Enter without a scan keeps the field'],
		['ST-AX', 'ST-A', null, 'ST-AX', 'slow typing after an earlier code is kept as typed']
	];
	it.each(cases)('%s (focus %j, burst %j) → %s: %s', (value, atFocus, scanned, expected) => {
		expect(scanFieldValue(value, atFocus, scanned)).toBe(expected);
	});
});
