import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import { ingestSpiFile } from '../ingest/ingest-service';
import { firstPassYield, readYieldFilters } from './first-pass-yield';

let t: ReturnType<typeof openTestDatabase>;
const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';

/** Hand-made boards: A passes, B fails then passes on re-inspection, C fails (line L2), D passes. */
beforeAll(async () => {
	t = openTestDatabase();
	const rows = [
		HEADER,
		'A,2026-03-02T08:00:00Z,L1,P1,0,R1,1,100,100,120,0,0,pass',
		'A,2026-03-02T08:00:00Z,L1,P1,0,R1,2,100,100,120,0,0,warn',
		'B,2026-03-02T09:00:00Z,L1,P1,0,R1,1,40,100,120,0,0,fail',
		'B,2026-03-02T09:00:00Z,L1,P1,0,R1,2,45,100,120,0,0,fail',
		'B,2026-03-02T10:00:00Z,L1,P1,0,R1,1,100,100,120,0,0,pass',
		'C,2026-03-09T09:00:00Z,L2,P1,0,R1,1,40,100,120,0,0,fail',
		'D,2026-03-09T10:00:00Z,L2,P2,0,R1,1,100,100,120,0,0,pass'
	];
	const text = rows.join('\n') + '\n';
	const outcome = await ingestSpiFile(t.db, {
		source: 'api',
		fileName: 'yield.csv',
		body: (async function* () {
			yield new TextEncoder().encode(text);
		})(),
		createdBy: 'system'
	});
	expect(outcome.status).toBe('imported');
}, 60_000);
afterAll(() => t.close());

const q = (s: string) => readYieldFilters(new URL(`http://x/?${s}`));

describe('firstPassYield', () => {
	it('counts each serial once, at its first inspection', () => {
		const a = firstPassYield(t.db, q('by=line'));
		expect(a.groups).toEqual([
			{ key: 'L1', boards: 2, passBoards: 1, firstPassYield: 0.5, failingPads: 2 },
			{ key: 'L2', boards: 2, passBoards: 1, firstPassYield: 0.5, failingPads: 1 }
		]);
		expect(a.reinspections).toBe(1);
		expect(a.total).toEqual({ boards: 4, passBoards: 2, firstPassYield: 0.5 });
	});
	it('groups by product and by ISO week, and filters', () => {
		expect(
			firstPassYield(t.db, q('by=product')).groups.map((g) => [g.key, g.boards, g.passBoards])
		).toEqual([
			['P1', 3, 1],
			['P2', 1, 1]
		]);
		// 2 March 2026 is a Monday in ISO week 10; 9 March starts week 11.
		expect(firstPassYield(t.db, q('by=week')).groups.map((g) => g.key)).toEqual([
			'2026-W10',
			'2026-W11'
		]);
		expect(firstPassYield(t.db, q('by=line&from=2026-03-09')).total.boards).toBe(2);
	});
	it('refuses an unknown grouping', () => {
		// (was by=shift, which is a grouping now: first-pass-yield-shift.test.ts)
		expect(() => q('by=colour')).toThrow();
	});
});
