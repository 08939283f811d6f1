import { describe, expect, it } from 'vitest';
import {
	dueItems,
	dueStatus,
	FLOOR_DEFAULTS,
	lineTile,
	passRatePct,
	runSide,
	sortTiles,
	stencilSide,
	wordsForMinutes,
	type BoardFact,
	type LineFacts
} from './tile';

const MIN = 60_000;
const HOUR = 60 * MIN;
const DAY = 24 * HOUR;
const NOW = Date.parse('2026-03-02T12:00:00Z');

function board(i: number, pass = true, at = NOW - i * 30_000): BoardFact {
	return {
		id: 1000 - i,
		atMs: at,
		pass,
		volumePctMean: 100 + i,
		heightUmMean: 120,
		offsetXUmMean: -2,
		offsetYUmMean: 4
	};
}

/** A healthy line: run 2 h old, 300 boards, fresh paste, clean stencil, tension last week. */
function facts(over: Partial<LineFacts> = {}): LineFacts {
	return {
		line: { id: 1, code: 'SMT-1', name: 'Line 1' },
		run: {
			id: 7,
			productCode: 'PB-100',
			productName: 'Pump controller board',
			startedAtMs: NOW - 2 * HOUR,
			boardsPrinted: 300,
			wipeIntervalPrints: 3
		},
		lastRunEndedAtMs: NOW - 3 * HOUR,
		stencil: {
			id: 3,
			name: 'ST-PB100-T',
			revision: 'B',
			state: 'in-use',
			thicknessUm: 120,
			ratedLifePrints: 50_000,
			printCount: 10_000,
			printsSinceClean: 300,
			lastCleanAtMs: NOW - 2 * HOUR,
			lastTension: { atMs: NOW - 7 * DAY, pass: true, minimumNPerCm: 40 }
		},
		pasteLot: {
			id: 5,
			lotNumber: 'PL-1',
			expiresAtMs: NOW + 30 * DAY,
			state: 'on-stencil',
			onStencilAtMs: NOW - 2 * HOUR,
			maxOnStencilMinutes: 480,
			outOfColdPeriods: [{ fromMs: NOW - 6 * HOUR, toMs: null }],
			maxOutOfColdMinutes: 1440
		},
		boards: Array.from({ length: 20 }, (_, i) => board(i)),
		targets: { volumePct: 100, heightUm: 120, offsetUm: 0 },
		characteristics: [],
		signals: [],
		...over
	};
}

const item = (f: LineFacts, key: string, now = NOW) => dueItems(f, now).find((d) => d.key === key);

describe('dueStatus: below 0 late, 0 due, within soon soon', () => {
	it.each([
		[-1, 'late'],
		[0, 'due'],
		[1, 'soon'],
		[60, 'soon'],
		[61, 'ok']
	] as const)('%i left with soon = 60 → %s', (left, status) => {
		expect(dueStatus(left, 60)).toBe(status);
	});
});

describe('what is due', () => {
	it('a healthy line is printing, with every check ok and the next wipe', () => {
		const tile = lineTile(facts(), NOW);
		expect(tile.state).toBe('printing');
		expect(tile.stateWord).toBe('printing');
		expect(tile.reasons).toEqual([]);
		// 300 prints with a wipe every 3: a wipe just happened, the next in 3 prints.
		expect(item(facts(), 'wipe')).toMatchObject({ status: 'ok', remainingPrints: 3 });
		expect(item(facts({ run: { ...facts().run!, boardsPrinted: 301 } }), 'wipe')).toMatchObject({
			remainingPrints: 2,
			text: 'wipe in 2 prints (every 3)'
		});
		expect(tile.due.every((d) => d.status === 'ok')).toBe(true);
	});

	it('paste on the stencil: 120 of 480 min used leaves 360; soon in the last hour; late after', () => {
		expect(item(facts(), 'paste-on-stencil')).toMatchObject({
			status: 'ok',
			remainingMinutes: 360
		});
		const at = (minutesOn: number) =>
			item(
				facts({ pasteLot: { ...facts().pasteLot!, onStencilAtMs: NOW - minutesOn * MIN } }),
				'paste-on-stencil'
			);
		expect(at(420)).toMatchObject({ status: 'soon', remainingMinutes: 60 });
		expect(at(480)).toMatchObject({ status: 'due', remainingMinutes: 0 });
		expect(at(500)).toMatchObject({ status: 'late', remainingMinutes: -20 });
		expect(at(500)!.text).toContain('20 min over');
	});

	it('paste not yet on the stencil has no on-stencil clock', () => {
		const f = facts({ pasteLot: { ...facts().pasteLot!, state: 'opened', onStencilAtMs: null } });
		expect(item(f, 'paste-on-stencil')).toBeUndefined();
	});

	it('paste out of cold storage: the periods out summed up to now against the limit', () => {
		const at = (periods: { fromMs: number; toMs: number | null }[]) =>
			item(
				facts({ pasteLot: { ...facts().pasteLot!, outOfColdPeriods: periods } }),
				'paste-out-of-cold'
			);
		expect(at([{ fromMs: NOW - 6 * HOUR, toMs: null }])).toMatchObject({
			status: 'ok',
			remainingMinutes: 18 * 60
		});
		// 20 h out and back in, then 3.5 h out again: 23.5 h of 24 h.
		expect(
			at([
				{ fromMs: NOW - 30 * HOUR, toMs: NOW - 10 * HOUR },
				{ fromMs: NOW - 3.5 * HOUR, toMs: null }
			])
		).toMatchObject({
			status: 'soon',
			remainingMinutes: 30
		});
		expect(at([{ fromMs: NOW - 25 * HOUR, toMs: null }])).toMatchObject({
			status: 'late',
			remainingMinutes: -60
		});
	});

	it('lot expiry: soon within 24 h, late from the expiry instant on', () => {
		const at = (ms: number) =>
			item(facts({ pasteLot: { ...facts().pasteLot!, expiresAtMs: ms } }), 'lot-expiry');
		expect(at(NOW + 30 * DAY)).toMatchObject({ status: 'ok', remainingMinutes: 30 * 24 * 60 });
		expect(at(NOW + 23 * HOUR)).toMatchObject({ status: 'soon', remainingMinutes: 23 * 60 });
		expect(at(NOW)).toMatchObject({ status: 'late' });
		expect(at(NOW - 2 * HOUR)).toMatchObject({
			status: 'late',
			text: 'paste lot PL-1 expired 2 h ago'
		});
	});

	it('stencil clean by prints: 2,000 per clean, soon in the last 200', () => {
		const at = (prints: number) =>
			item(facts({ stencil: { ...facts().stencil!, printsSinceClean: prints } }), 'stencil-clean');
		expect(at(300)).toMatchObject({ status: 'ok', remainingPrints: 1700 });
		expect(at(1800)).toMatchObject({ status: 'soon', remainingPrints: 200 });
		expect(at(2000)).toMatchObject({ status: 'due', remainingPrints: 0 });
		expect(at(2050)).toMatchObject({ status: 'late', remainingPrints: -50 });
	});

	it('stencil clean by time: 24 h after the last clean, whichever comes first', () => {
		const f = facts({ stencil: { ...facts().stencil!, lastCleanAtMs: NOW - 25 * HOUR } });
		expect(item(f, 'stencil-clean')).toMatchObject({
			status: 'late',
			remainingMinutes: -60,
			remainingPrints: 1700
		});
	});

	it('tension: due now when never measured, soon 3 days ahead, late after 30 days or when failed', () => {
		const at = (
			lastTension: LineFacts['stencil'] extends infer S
				? S extends { lastTension: infer T }
					? T
					: never
				: never
		) => item(facts({ stencil: { ...facts().stencil!, lastTension } }), 'tension-check');
		expect(at(null)).toMatchObject({ status: 'due' });
		expect(at({ atMs: NOW - 28 * DAY, pass: true, minimumNPerCm: 40 })).toMatchObject({
			status: 'soon',
			remainingMinutes: 2 * 24 * 60
		});
		expect(at({ atMs: NOW - 31 * DAY, pass: true, minimumNPerCm: 40 })).toMatchObject({
			status: 'late',
			remainingMinutes: -24 * 60
		});
		expect(at({ atMs: NOW - DAY, pass: false, minimumNPerCm: 30 })).toMatchObject({
			status: 'late'
		});
	});

	it('stencil life: soon from 90 %, late at the rated life', () => {
		const at = (printCount: number) =>
			item(facts({ stencil: { ...facts().stencil!, printCount } }), 'stencil-life');
		expect(at(44_999)).toMatchObject({ status: 'ok', remainingPrints: 5001 });
		expect(at(45_000)).toMatchObject({ status: 'soon', remainingPrints: 5000 });
		expect(at(50_000)).toMatchObject({ status: 'late', remainingPrints: 0 });
	});

	it('no run: nothing is due and the line is idle since the last run ended', () => {
		const f = facts({ run: null });
		expect(dueItems(f, NOW)).toEqual([]);
		const tile = lineTile(f, NOW);
		expect(tile).toMatchObject({
			state: 'idle',
			idleSince: new Date(NOW - 3 * HOUR).toISOString(),
			product: null,
			stencil: null,
			paste: null
		});
	});

	it('orders late before due before soon before ok, nearest first', () => {
		const f = facts({
			stencil: { ...facts().stencil!, printsSinceClean: 1900, lastTension: null },
			pasteLot: { ...facts().pasteLot!, onStencilAtMs: NOW - 500 * MIN }
		});
		expect(dueItems(f, NOW).map((d) => [d.key, d.status])).toEqual([
			['paste-on-stencil', 'late'],
			['tension-check', 'due'],
			['stencil-clean', 'soon'],
			['wipe', 'ok'],
			['paste-out-of-cold', 'ok'],
			['stencil-life', 'ok'],
			['lot-expiry', 'ok']
		]);
	});
});

describe('line state', () => {
	it('stopped when the paste is over its time on the stencil', () => {
		const tile = lineTile(
			facts({ pasteLot: { ...facts().pasteLot!, onStencilAtMs: NOW - 481 * MIN } }),
			NOW
		);
		expect(tile.state).toBe('stopped');
		expect(tile.reasons[0]).toContain('over its 8 h on the stencil');
	});

	it('stopped when no board came for 10 minutes', () => {
		const boards = [board(0, true, NOW - 11 * MIN)];
		const tile = lineTile(facts({ boards }), NOW);
		expect(tile.state).toBe('stopped');
		expect(tile.reasons).toContain('no board for 11 min');
		expect(lineTile(facts({ boards: [board(0, true, NOW - 9 * MIN)] }), NOW).state).toBe(
			'printing'
		);
	});

	it('attention for an open signal, a low pass rate or a check due now (not for soon)', () => {
		const signal = {
			id: 1,
			characteristicId: 2,
			characteristic: 'Volume C12',
			rule: 'beyond-limits',
			createdAtMs: NOW - 95 * MIN,
			owner: null,
			printRunId: 7,
			boardIds: [999],
			pointKey: 'board:999'
		};
		const withSignal = lineTile(facts({ signals: [signal] }), NOW);
		expect(withSignal.state).toBe('attention');
		expect(withSignal.signals[0]).toMatchObject({
			id: 1,
			ageMinutes: 95,
			createdAt: new Date(NOW - 95 * MIN).toISOString()
		});

		// 8 of the last 10 pass: 80 % < 90 %.
		const boards = Array.from({ length: 20 }, (_, i) => board(i, i !== 2 && i !== 5));
		const low = lineTile(facts({ boards }), NOW);
		expect(low.state).toBe('attention');
		expect(low.spi.passRateLast10Pct).toBe(80);
		expect(low.spi.passRateLast100Pct).toBe(90);

		const dueNow = lineTile(facts({ stencil: { ...facts().stencil!, lastTension: null } }), NOW);
		expect(dueNow.state).toBe('attention');
		const soon = lineTile(facts({ stencil: { ...facts().stencil!, printsSinceClean: 1850 } }), NOW);
		expect(soon.state).toBe('printing');
		expect(soon.reasons).toEqual(['stencil clean in 150 prints (1850 since the last)']);
	});

	it('means over the last 100 boards against their targets', () => {
		const tile = lineTile(facts(), NOW);
		// volumePctMean is 100 + i for i = 0..19: mean 109.5.
		expect(tile.spi.volumePct).toEqual({ mean: 109.5, target: 100, boards: 20 });
		expect(tile.spi.heightUm).toEqual({ mean: 120, target: 120, boards: 20 });
		expect(tile.spi.offsetXUm).toEqual({ mean: -2, target: 0, boards: 20 });
		expect(tile.run).toMatchObject({ boardsPrinted: 300, minutesSinceLastBoard: 0 });
		expect(tile.side).toBe('top');
	});

	it('takes the side from the stencil approval for the product before the stencil name', () => {
		const stencil = facts().stencil!;
		const bottom = lineTile(facts({ stencil: { ...stencil, approvedSides: ['bottom'] } }), NOW);
		expect(bottom.side).toBe('bottom');
		// Approved for both sides: the approval does not tell, the name does.
		const both = lineTile(
			facts({ stencil: { ...stencil, approvedSides: ['bottom', 'top'] } }),
			NOW
		);
		expect(both.side).toBe('top');
		expect(runSide({ name: 'ST-X', approvedSides: [] })).toBeNull();
		expect(runSide({ name: 'ST-X', approvedSides: ['top'] })).toBe('top');
		expect(runSide(null)).toBeNull();
	});
});

describe('helpers', () => {
	it('passRatePct over the newest n boards', () => {
		expect(passRatePct([], 10)).toBeNull();
		expect(passRatePct([board(0, false), board(1), board(2), board(3)], 10)).toBe(75);
		expect(passRatePct([board(0, false), board(1)], 1)).toBe(0);
	});

	it('stencilSide reads -T / -B suffixes only', () => {
		expect(stencilSide('ST-PB100-T')).toBe('top');
		expect(stencilSide('ST-PB100-BOT')).toBe('bottom');
		expect(stencilSide('ST-PB100')).toBeNull();
		expect(stencilSide('ST-TB')).toBeNull();
	});

	it('wordsForMinutes', () => {
		expect(wordsForMinutes(45)).toBe('45 min');
		expect(wordsForMinutes(200)).toBe('3 h 20 min');
		expect(wordsForMinutes(3 * 24 * 60 + 120)).toBe('3 d 2 h');
	});

	it('sortTiles: stopped, attention, printing, idle, then line code numerically', () => {
		const tiles = [
			{ state: 'idle', lineCode: 'SMT-2' },
			{ state: 'printing', lineCode: 'SMT-10' },
			{ state: 'printing', lineCode: 'SMT-9' },
			{ state: 'stopped', lineCode: 'SMT-3' }
		] as const;
		expect(sortTiles(tiles).map((t) => t.lineCode)).toEqual(['SMT-3', 'SMT-9', 'SMT-10', 'SMT-2']);
		expect(FLOOR_DEFAULTS.stallMinutes).toBe(10);
	});
});
