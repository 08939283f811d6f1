import { describe, it, expect } from 'vitest';
import {
	PASTE_EVENTS,
	checkNextPasteEvent,
	formatMinutes,
	minutesOutOfCold,
	nextPasteState,
	pasteTransitionProblem,
	replayPasteEvents
} from './paste-events';
import type { PasteEventType, PasteState } from './paste-events';
import { formatFieldError } from './field-error';

const T0 = Date.UTC(2026, 2, 2, 6, 0, 0); // 2026-03-02 06:00 UTC
const minutes = (m: number) => new Date(T0 + m * 60_000).toISOString();

describe('state machine table', () => {
	// Full 5 × 5 table: expected next state, or null when refused.
	const table: Record<PasteState, Record<PasteEventType, PasteState | null>> = {
		'cold-storage': {
			'out-of-cold-storage': 'out-sealed',
			opened: null,
			'on-stencil': null,
			returned: null,
			discarded: 'discarded'
		},
		'out-sealed': {
			'out-of-cold-storage': null,
			opened: 'opened',
			'on-stencil': null,
			returned: 'cold-storage',
			discarded: 'discarded'
		},
		opened: {
			'out-of-cold-storage': null,
			opened: null,
			'on-stencil': 'on-stencil',
			returned: null,
			discarded: 'discarded'
		},
		'on-stencil': {
			'out-of-cold-storage': null,
			opened: null,
			'on-stencil': null,
			returned: null,
			discarded: 'discarded'
		},
		discarded: {
			'out-of-cold-storage': null,
			opened: null,
			'on-stencil': null,
			returned: null,
			discarded: null
		}
	};
	const rows = (Object.keys(table) as PasteState[]).flatMap((state) =>
		PASTE_EVENTS.map((event) => [state, event, table[state][event]] as const)
	);
	it.each(rows)('%s + %s → %s', (state, event, expected) => {
		expect(nextPasteState(state, event)).toBe(expected);
		if (expected === null) expect(pasteTransitionProblem(state, event)).toMatch(/\w/);
		else expect(pasteTransitionProblem(state, event)).toBeNull();
	});

	it('explains why opened paste may not be re-refrigerated', () => {
		expect(pasteTransitionProblem('opened', 'returned')).toMatch(
			/must not go back to cold storage.*condensation/
		);
		expect(pasteTransitionProblem('on-stencil', 'returned')).toMatch(
			/do not re-refrigerate opened paste/
		);
	});
	it('explains that paste cannot be opened before leaving cold storage', () => {
		expect(pasteTransitionProblem('cold-storage', 'opened')).toMatch(
			/log 'out-of-cold-storage' first/
		);
	});
	it('nothing follows discarded', () => {
		expect(pasteTransitionProblem('discarded', 'out-of-cold-storage')).toBe(
			"the paste was discarded; no 'out-of-cold-storage' can follow"
		);
	});
});

describe('replayPasteEvents', () => {
	const life = [
		{ event: 'out-of-cold-storage', at: minutes(0) },
		{ event: 'returned', at: minutes(30) },
		{ event: 'out-of-cold-storage', at: minutes(60) },
		{ event: 'opened', at: minutes(300) },
		{ event: 'on-stencil', at: minutes(310) },
		{ event: 'discarded', at: minutes(900) }
	];

	it('replays a full life', () => {
		const replay = replayPasteEvents(life);
		expect(replay).toEqual({
			ok: true,
			timeline: {
				state: 'discarded',
				outOfColdPeriods: [
					{ fromMs: T0, toMs: T0 + 30 * 60_000 },
					{ fromMs: T0 + 60 * 60_000, toMs: null }
				],
				openedAtMs: T0 + 300 * 60_000,
				onStencilAtMs: T0 + 310 * 60_000,
				discardedAtMs: T0 + 900 * 60_000
			}
		});
	});

	it('ignores events after the cut-off, keeping events exactly at it', () => {
		const replay = replayPasteEvents(life, T0 + 310 * 60_000);
		expect(replay.ok && replay.timeline.state).toBe('on-stencil');
	});

	it('sums the minutes out of cold storage over every period', () => {
		const replay = replayPasteEvents(life);
		if (!replay.ok) throw new Error('replay failed');
		// 30 min in the first period + (400 − 60) min in the second.
		expect(minutesOutOfCold(replay.timeline, T0 + 400 * 60_000)).toBe(30 + 340);
		expect(minutesOutOfCold(replay.timeline, T0 + 15 * 60_000)).toBe(15);
	});

	const bad: [string, { event: string; at: string | number }[], string[]][] = [
		['empty log', [], []],
		[
			'unknown event',
			[{ event: 'thawed', at: minutes(0) }],
			[
				'events[0].event: must be one of out-of-cold-storage, opened, on-stencil, returned, discarded (got "thawed")'
			]
		],
		[
			'bad timestamp',
			[{ event: 'opened', at: 'noon' }],
			['events[0].at: must be an ISO 8601 date or date-time with a time zone (got "noon")']
		],
		[
			'backwards',
			[
				{ event: 'out-of-cold-storage', at: minutes(10) },
				{ event: 'opened', at: minutes(5) }
			],
			[`events[1].at: must not be before the previous event (${minutes(10)})`]
		],
		[
			'open while cold',
			[{ event: 'opened', at: minutes(0) }],
			[
				"events[0].event: 'opened' refused: cannot open paste that is still in cold storage: log 'out-of-cold-storage' first and let it warm up, or condensation forms inside"
			]
		]
	];
	it.each(bad)('%s', (_name, events, expected) => {
		const replay = replayPasteEvents(events);
		if (expected.length === 0) expect(replay.ok).toBe(true);
		else expect(!replay.ok && replay.errors.map(formatFieldError)).toEqual(expected);
	});

	it('same-time events keep their listed order', () => {
		const replay = replayPasteEvents([
			{ event: 'out-of-cold-storage', at: minutes(0) },
			{ event: 'discarded', at: minutes(0) }
		]);
		expect(replay.ok && replay.timeline.state).toBe('discarded');
	});
});

describe('checkNextPasteEvent', () => {
	const out = [{ event: 'out-of-cold-storage', at: minutes(0) }];
	const settings = { warmUpMinutes: 240 };
	const cases: [string, number, string[]][] = [
		[
			'opened 1 min early',
			239,
			[
				'opened after 3 h 59 min out of cold storage; the warm-up time is 4 h: condensation may form in the paste'
			]
		],
		['opened exactly at warm-up end', 240, []],
		['opened later', 241, []]
	];
	it.each(cases)('%s', (_name, at, warn) => {
		expect(checkNextPasteEvent(out, { event: 'opened', at: minutes(at) }, settings)).toEqual({
			error: null,
			warn
		});
	});

	it('refuses returning an opened jar with the reason, on the event field', () => {
		const history = [...out, { event: 'opened', at: minutes(240) }];
		const result = checkNextPasteEvent(history, { event: 'returned', at: minutes(250) }, settings);
		expect(result.error?.field).toBe('event');
		expect(result.error?.message).toMatch(
			/^'returned' refused: opened paste must not go back to cold storage/
		);
	});

	it('refuses an event earlier than the last one', () => {
		const result = checkNextPasteEvent(out, { event: 'opened', at: minutes(-1) }, settings);
		expect(result.error && formatFieldError(result.error)).toBe(
			`at: must not be before the previous event (${minutes(0)})`
		);
	});
});

describe('formatMinutes', () => {
	const cases: [number, string][] = [
		[0, '0 min'],
		[59.9, '59 min'],
		[60, '1 h'],
		[119.99, '1 h 59 min'],
		[150, '2 h 30 min'],
		[239.5, '3 h 59 min'],
		[1440, '24 h']
	];
	it.each(cases)('%s → %s', (m, text) => expect(formatMinutes(m)).toBe(text));
});
