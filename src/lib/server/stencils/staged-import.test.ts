import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import type { Actor } from '$lib/access';
import type { ApertureInput } from '$lib/stencil';
import { withLimits } from '$lib/stencil/limits';
import {
	ApertureImportError,
	createStencil,
	importApertures,
	importAperturesStaged,
	listImports,
	loadApertures
} from './index';

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

const pads = (n: number, extra: Partial<ApertureInput> = {}): ApertureInput[] =>
	Array.from({ length: n }, (_, k) => ({
		refdes: `R${k}`,
		pad: '1',
		shape: 'rectangle',
		lengthUm: 500,
		widthUm: 250,
		xUm: (k % 100) * 1000,
		yUm: Math.floor(k / 100) * 1000,
		rotationDeg: 0,
		...extra
	}));
const stencil = () =>
	createStencil(
		db,
		{ name: 'ST-S', revision: 'A', thicknessUm: 120, technology: 'laser-stainless' },
		engineer
	);

describe('importAperturesStaged', () => {
	it('stores a large list in import order, like importApertures, while yielding between chunks', async () => {
		const s = stencil();
		const list = pads(5_000);
		let ticks = 0;
		const timer = setInterval(() => ticks++, 0);
		const summary = await importAperturesStaged(
			db,
			s.id,
			list,
			{ source: 'json', mode: 'append' },
			engineer,
			undefined,
			500
		);
		clearInterval(timer);
		expect(summary).toMatchObject({ count: 5_000, totalApertures: 5_000 });
		const stored = loadApertures(db, s.id);
		expect(stored.map((a) => a.refdes)).toEqual(list.map((a) => a.refdes));
		// Other work ran between the chunks (timers fire only when the loop is free).
		expect(ticks).toBeGreaterThan(0);
		expect(listImports(db, s.id)).toHaveLength(1);
		// Nothing is left in the staging table.
		expect(
			(db.$client.prepare('select count(*) as n from temp.aperture_stage').get() as { n: number }).n
		).toBe(0);
	});

	it('replace swaps the old apertures for the new in one step', async () => {
		const s = stencil();
		importApertures(db, s.id, pads(10), { source: 'json', mode: 'append' }, engineer);
		await importAperturesStaged(
			db,
			s.id,
			pads(3_000, { pad: '2' }),
			{ source: 'json', mode: 'replace' },
			engineer,
			undefined,
			1_000
		);
		const stored = loadApertures(db, s.id);
		expect(stored).toHaveLength(3_000);
		expect(stored.every((a) => a.pad === '2')).toBe(true);
	});

	it('all or nothing: an invalid aperture or a stencil over its limit stores nothing', async () => {
		const s = stencil();
		const bad = pads(3_000);
		bad[2_500] = { ...bad[2_500], widthUm: -1 };
		await expect(
			importAperturesStaged(
				db,
				s.id,
				bad,
				{ source: 'json', mode: 'append' },
				engineer,
				undefined,
				1_000
			)
		).rejects.toBeInstanceOf(ApertureImportError);
		importApertures(db, s.id, pads(10), { source: 'json', mode: 'append' }, engineer);
		await expect(
			importAperturesStaged(
				db,
				s.id,
				pads(3_000),
				{ source: 'json', mode: 'append' },
				engineer,
				withLimits({ maxAperturesPerStencil: 3_005 }),
				1_000
			)
		).rejects.toThrow(/would hold 3010 apertures/);
		expect(loadApertures(db, s.id)).toHaveLength(10);
		expect(
			(db.$client.prepare('select count(*) as n from temp.aperture_stage').get() as { n: number }).n
		).toBe(0);
	});
});
