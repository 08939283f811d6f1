import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import { ingestSpiFile } from '../ingest/ingest-service';
import { createStencil } from '../stencils/stencils';
import { failureMap, readFailureMapFilters } from './failure-map';

let t: ReturnType<typeof openTestDatabase>;
const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result,stencil';

beforeAll(async () => {
	t = openTestDatabase();
	createStencil(
		t.db,
		{ name: 'ST-K', revision: 'A', thicknessUm: 120, technology: 'laser-stainless', notes: '' },
		null
	);
	// One failure of each kind on a 120 µm foil, a second volume-low that only the machine's
	// tighter limit failed (55 % is inside 50–150 %), and passes and warnings that never count.
	const rows = [
		HEADER,
		'K1,2026-03-02T08:00:00Z,L1,PK,0,R1,1,40,100,120,0,0,fail,ST-K',
		'K1,2026-03-02T08:00:00Z,L1,PK,0,R1,2,170,100,120,0,0,fail,ST-K',
		'K1,2026-03-02T08:00:00Z,L1,PK,0,R2,1,100,100,50,0,0,fail,ST-K',
		'K1,2026-03-02T08:00:00Z,L1,PK,0,R2,2,100,30,120,0,0,fail,ST-K',
		'K2,2026-03-02T09:00:00Z,L1,PK,0,R1,1,100,100,120,150,0,fail,ST-K',
		'K2,2026-03-02T09:00:00Z,L1,PK,0,R1,2,100,100,120,0,-140,fail,ST-K',
		'K2,2026-03-02T09:00:00Z,L1,PK,0,R2,1,55,100,120,0,0,fail,ST-K',
		'K2,2026-03-02T09:00:00Z,L1,PK,0,R2,2,20,100,120,0,0,warn,ST-K',
		'K3,2026-03-02T10:00:00Z,L1,PK,0,R1,1,10,10,10,500,500,pass,ST-K'
	];
	const text = rows.join('\n') + '\n';
	const outcome = await ingestSpiFile(t.db, {
		source: 'api',
		fileName: 'kinds.csv',
		body: (async function* () {
			yield new TextEncoder().encode(text);
		})(),
		createdBy: 'system'
	});
	if (outcome.status !== 'imported') throw new Error(JSON.stringify(outcome));
}, 60_000);
afterAll(() => t.close());

const q = (s: string) => readFailureMapFilters(new URL(`http://x/?${s}`));

describe('Pareto of SPI failures by kind', () => {
	it('counts each failed pad once, under the measure that broke its window furthest', async () => {
		const m = await failureMap(t.db, q('product=PK'));
		const fails = m.pads.reduce((s, p) => s + p.fails, 0);
		expect(m.byKind.reduce((s, k) => s + k.fails, 0)).toBe(fails);
		expect(fails).toBe(7);
		// 2 of 7, then five kinds with 1 each (ties in key order); running shares end at 1.
		expect(m.byKind.map((k) => [k.kind, k.fails])).toEqual([
			['volume-low', 2],
			['area-low', 1],
			['height-low', 1],
			['offset-x', 1],
			['offset-y', 1],
			['volume-high', 1]
		]);
		expect(m.byKind[0]).toMatchObject({ label: 'Volume low', share: 2 / 7 });
		expect(m.byKind.map((k) => k.cumulativeShare)).toEqual([2, 3, 4, 5, 6, 7].map((n) => n / 7));
		expect(m.failsWithinWindows).toBe(1);
		expect(m.windows.volumePct).toEqual({ low: 50, high: 150 });
	});

	it('gives an empty Pareto when nothing failed', async () => {
		const m = await failureMap(t.db, q('product=PK&from=2026-03-02T10:00:00Z'));
		expect(m.boards).toBe(1);
		expect(m.byKind).toEqual([]);
		expect(m.failsWithinWindows).toBe(0);
	});
});
