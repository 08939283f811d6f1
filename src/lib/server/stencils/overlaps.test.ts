import { afterEach, beforeEach, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import type { Actor } from '$lib/access';
import type { ApertureInput } from '$lib/stencil';
import { checkStoredStencil, createStencil, importApertures, stencilAdvice } from './index';

const engineer: Actor = { kind: 'user', id: 1, email: 'e@x', name: 'E', role: 'engineer' };
let db: Db;
let close: () => void;
beforeEach(() => {
	({ db, close } = openTestDatabase());
	db.$client
		.prepare(
			"insert into users (id, email, name, role, password_hash) values (1, 'e@x', 'E', 'engineer', 'x')"
		)
		.run();
});
afterEach(() => close());

const pad = (refdes: string, xUm: number): ApertureInput => ({
	refdes,
	pad: '1',
	shape: 'rectangle',
	lengthUm: 1000,
	widthUm: 1000,
	xUm,
	yUm: 0,
	rotationDeg: 0
});

it('names overlapping openings and gives the paste area summed and as a union', () => {
	const s = createStencil(
		db,
		{ name: 'ST-O', revision: 'A', thicknessUm: 120, technology: 'laser-stainless' },
		engineer
	);
	// C1 and C2 share 0.5 × 1 mm; C3 stands alone.
	importApertures(
		db,
		s.id,
		[pad('C1', 0), pad('C2', 500), pad('C3', 5000)],
		{ source: 'json', mode: 'append' },
		engineer
	);
	const o = stencilAdvice(checkStoredStencil(db, s.id)).overlaps;
	expect(o.pairCount).toBe(1);
	expect(o.pairs[0]).toMatchObject({ a: { refdes: 'C1' }, b: { refdes: 'C2' } });
	expect(o.pairs[0].areaUm2).toBeCloseTo(500_000, 3);
	expect(o.sumAreaUm2).toBeCloseTo(3_000_000, 6);
	expect(o.unionAreaUm2).toBeCloseTo(2_500_000, 3);
	expect(o.complete).toBe(true);
});
