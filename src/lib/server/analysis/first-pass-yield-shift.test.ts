import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import { ingestSpiFile } from '../ingest/ingest-service';
import { firstPassYield, readYieldFilters } from './first-pass-yield';

let t: ReturnType<typeof openTestDatabase>;
const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';

/** Boards on both sides of each shift change (UTC), one failing board per night and morning. */
beforeAll(async () => {
	t = openTestDatabase();
	const board = (serial: string, at: string, result: string) =>
		`${serial},${at},L1,P1,0,R1,1,100,100,120,0,0,${result}`;
	const rows = [
		HEADER,
		board('S1', '2026-03-02T05:59:00Z', 'pass'),
		board('S2', '2026-03-02T06:00:00Z', 'fail'),
		board('S3', '2026-03-02T13:59:30Z', 'pass'),
		board('S4', '2026-03-02T14:00:00Z', 'pass'),
		board('S5', '2026-03-02T23:30:00Z', 'fail'),
		board('S6', '2026-03-03T01:00:00Z', 'pass'),
		board('S6', '2026-03-03T15:00:00Z', 'fail') // a re-inspection: left out
	];
	const outcome = await ingestSpiFile(t.db, {
		source: 'api',
		fileName: 'shifts.csv',
		body: (async function* () {
			yield new TextEncoder().encode(rows.join('\n') + '\n');
		})(),
		createdBy: 'system'
	});
	expect(outcome.status).toBe('imported');
}, 60_000);
afterAll(() => t.close());

const q = (s: string) => readYieldFilters(new URL(`http://x/?${s}`));
const THREE = ['06:00', '14:00', '22:00'];
const table = (a: ReturnType<typeof firstPassYield>) =>
	a.groups.map((g) => [g.key, g.boards, g.passBoards]);

describe('first-pass yield by shift', () => {
	it('puts each first inspection in the shift of the day it falls in (UTC, three 8-hour shifts)', () => {
		const a = firstPassYield(t.db, q('by=shift'), { starts: THREE, timeZone: 'UTC' });
		expect(a.by).toBe('shift');
		expect(table(a)).toEqual([
			['06:00–14:00', 2, 1],
			['14:00–22:00', 1, 1],
			['22:00–06:00', 3, 2]
		]);
		expect(a.reinspections).toBe(1);
		expect(a.total).toEqual({ boards: 6, passBoards: 4, firstPassYield: 4 / 6 });
		expect(a.groups[0].firstPassYield).toBe(0.5);
		expect(a.groups[0].failingPads).toBe(1);
	});

	it('follows the site clock: in Berlin (UTC+1 in March) every board moves an hour later', () => {
		const a = firstPassYield(t.db, q('by=shift'), { starts: THREE, timeZone: 'Europe/Berlin' });
		expect(table(a)).toEqual([
			['06:00–14:00', 2, 1],
			['14:00–22:00', 2, 2],
			['22:00–06:00', 2, 1]
		]);
	});

	it('takes other shift patterns, leaves out shifts without boards, and filters by dates', () => {
		const two = { starts: ['07:00', '19:00'], timeZone: 'UTC' };
		expect(table(firstPassYield(t.db, q('by=shift'), two))).toEqual([
			['07:00–19:00', 2, 2],
			['19:00–07:00', 4, 2]
		]);
		const morning = firstPassYield(
			t.db,
			q('by=shift&from=2026-03-02T06:00:00Z&to=2026-03-02T14:00:00Z'),
			{
				starts: THREE,
				timeZone: 'UTC'
			}
		);
		expect(table(morning)).toEqual([['06:00–14:00', 2, 1]]);
	});

	it('uses the site shifts by default (SHIFT_STARTS unset: 06:00, 14:00, 22:00 UTC)', () => {
		const keys = firstPassYield(t.db, q('by=shift')).groups.map((g) => g.key);
		expect(keys).toEqual(['06:00–14:00', '14:00–22:00', '22:00–06:00']);
	});
});
