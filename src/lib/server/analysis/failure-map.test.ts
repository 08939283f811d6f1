import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import { ingestSpiFile } from '../ingest/ingest-service';
import { failureMap, padClassOf, readFailureMapFilters } from './failure-map';

let t: ReturnType<typeof openTestDatabase>;
const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';

beforeAll(async () => {
	t = openTestDatabase();
	const rows = [
		HEADER,
		'A,2026-03-02T08:00:00Z,L1,P1,0,R1,1,100,100,120,0,0,pass',
		'A,2026-03-02T08:00:00Z,L1,P1,0,R1,2,100,100,120,0,0,warn',
		'A,2026-03-02T08:00:00Z,L1,P1,0,U7,1,100,100,120,0,0,pass',
		'B,2026-03-02T09:00:00Z,L1,P1,0,R1,1,40,100,120,0,0,fail',
		'B,2026-03-02T09:00:00Z,L1,P1,0,R1,2,45,100,120,0,0,fail',
		'B,2026-03-02T10:00:00Z,L1,P1,0,R1,1,100,100,120,0,0,pass',
		'C,2026-03-09T09:00:00Z,L2,P1,0,R1,1,40,100,120,0,0,fail',
		'C,2026-03-09T09:00:00Z,L2,P1,0,U7,1,30,100,120,0,0,fail',
		'D,2026-03-09T10:00:00Z,L2,P2,0,R1,1,100,100,120,0,0,pass'
	];
	const text = rows.join('\n') + '\n';
	await ingestSpiFile(t.db, {
		source: 'api',
		fileName: 'map.csv',
		body: (async function* () {
			yield new TextEncoder().encode(text);
		})(),
		createdBy: 'system'
	});
}, 60_000);
afterAll(() => t.close());

const q = (s: string) => readFailureMapFilters(new URL(`http://x/?${s}`));

describe('failureMap', () => {
	it('counts inspections, fails and warnings per pad over every inspection of the product', async () => {
		const m = await failureMap(t.db, q('product=P1'));
		expect(m.boards).toBe(4);
		const pad = (r: string, p: string) => m.pads.find((x) => x.refdes === r && x.pad === p)!;
		expect(pad('R1', '1')).toMatchObject({
			inspected: 4,
			fails: 2,
			warns: 0,
			failRate: 0.5,
			xUm: null
		});
		expect(pad('R1', '2')).toMatchObject({ inspected: 2, fails: 1, warns: 1 });
		expect(pad('U7', '1')).toMatchObject({ inspected: 2, fails: 1 });
		expect(m.byClass).toEqual([
			{ padClass: 'R', fails: 3, warns: 1, inspected: 6, failRate: 0.5 },
			{ padClass: 'U', fails: 1, warns: 0, inspected: 2, failRate: 0.5 }
		]);
	});
	it('filters by line and dates, and needs a product', async () => {
		expect((await failureMap(t.db, q('product=P1&line=L2'))).boards).toBe(1);
		expect((await failureMap(t.db, q('product=P1&to=2026-03-02'))).boards).toBe(3);
		expect(() => q('line=L1')).toThrow();
	});
	it('names pad classes by the refdes letters', () => {
		expect(['U12', 'LED3', 'r5', '12'].map(padClassOf)).toEqual(['U', 'LED', 'R', '?']);
	});
});
