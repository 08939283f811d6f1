import { describe, it, expect } from 'vitest';
import { parseCentroidCsv } from './centroid-csv';

describe('parseCentroidCsv', () => {
	it('reads refdes, x, y in the chosen unit, ignoring other columns', () => {
		expect(
			parseCentroidCsv(
				'Designator,Mid X,Mid Y,Rotation,Side\nU1,10,5.5,90,top\nR2,-1,0,0,top\n',
				'mm'
			)
		).toEqual({
			centroids: [
				{ refdes: 'U1', xUm: 10000, yUm: 5500 },
				{ refdes: 'R2', xUm: -1000, yUm: 0 }
			]
		});
	});
	it('inch: 1 in = 25400 µm', () => {
		expect(parseCentroidCsv('refdes,x,y\nU1,1,0.5\n', 'inch')).toEqual({
			centroids: [{ refdes: 'U1', xUm: 25400, yUm: 12700 }]
		});
	});
	const bad: { name: string; text: string; want: [number, string | null][] }[] = [
		{ name: 'missing y column', text: 'refdes,x\nU1,1\n', want: [[1, 'y']] },
		{
			name: 'empty refdes and bad number',
			text: 'refdes,x,y\n,1,2\nU2,1,two\n',
			want: [
				[2, 'refdes'],
				[3, 'y']
			]
		},
		{ name: 'duplicate refdes', text: 'refdes,x,y\nU1,1,2\nU1,3,4\n', want: [[3, 'refdes']] }
	];
	for (const c of bad)
		it(c.name, () => {
			const r = parseCentroidCsv(c.text, 'mm');
			expect('errors' in r && r.errors.map((e) => [e.row, e.column])).toEqual(c.want);
		});
	it('duplicate message names the first line', () => {
		const r = parseCentroidCsv('refdes,x,y\nU1,1,2\nU1,3,4\n', 'mm');
		expect('errors' in r && r.errors[0].message).toBe(
			'line 3, refdes: U1 already appears on line 2'
		);
	});
});
