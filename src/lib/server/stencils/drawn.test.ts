import { readFileSync } from 'node:fs';
import { afterEach, beforeEach, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import type { Actor } from '$lib/access';
import { importGerberPasteLayer } from '$lib/stencil/gerber-import';
import { createRevision, createStencil, importApertures, loadApertures } from './index';

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

it('stores the drawn mark of stroked openings and keeps it through a revision copy', () => {
	const r = importGerberPasteLayer(readFileSync('reference/gerber/qfp45-strokes.gbr', 'utf8'));
	if ('errors' in r) throw new Error(JSON.stringify(r.errors));
	const s = createStencil(
		db,
		{ name: 'ST-D', revision: 'A', thicknessUm: 120, technology: 'laser-stainless' },
		engineer
	);
	const flash = {
		refdes: 'R1',
		pad: '1',
		shape: 'circle' as const,
		diameterUm: 300,
		xUm: 0,
		yUm: 0,
		rotationDeg: 0
	};
	importApertures(
		db,
		s.id,
		[...r.apertures, flash],
		{ source: 'gerber', mode: 'append' },
		engineer
	);
	const stored = loadApertures(db, s.id);
	expect(stored.filter((a) => a.drawn === true)).toHaveLength(44);
	expect(stored.find((a) => a.refdes === 'R1')?.drawn).toBeUndefined();
	const b = createRevision(
		db,
		s.id,
		{ revision: 'B', thicknessUm: 120, technology: 'laser-stainless' },
		engineer
	);
	expect(loadApertures(db, b.id).filter((a) => a.drawn === true)).toHaveLength(44);
});
