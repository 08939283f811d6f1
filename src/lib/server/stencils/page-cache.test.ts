import { afterEach, beforeEach, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import type { Actor } from '$lib/access';
import { mapLayers, type ApertureInput } from '$lib/stencil';
import { columnRow, type StencilColumnsAnswer } from '$lib/stencil/aperture-columns';
import {
	cachedStencil,
	checkStoredStencil,
	createStencil,
	deleteAperture,
	importApertures,
	saveSiteThresholds,
	siteThresholds,
	stencilAdvice
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

/** Area ratio of a W × W square at 120 µm: W / (4 · 120); 300 µm → 0.625 (fails 0.66). */
const square = (refdes: string, widthUm: number, xUm: number): ApertureInput => ({
	refdes,
	pad: '1',
	shape: 'rectangle',
	lengthUm: widthUm,
	widthUm,
	xUm,
	yUm: 0,
	rotationDeg: 0
});

function stencilWith(list: ApertureInput[]) {
	const s = createStencil(
		db,
		{ name: 'ST-C', revision: 'A', thicknessUm: 120, technology: 'laser-stainless' },
		engineer
	);
	importApertures(db, s.id, list, { source: 'json', mode: 'append' }, engineer);
	return s.id;
}

it('answers what the uncached check answers, rows and columns alike', () => {
	const id = stencilWith([
		square('R1', 300, 0),
		square('R2', 400, 1000),
		{ refdes: 'U1', pad: '1', shape: 'circle', diameterUm: 350, xUm: 3000, yUm: 0, rotationDeg: 0 }
	]);
	const fresh = checkStoredStencil(db, id);
	const cached = cachedStencil(db, id);
	expect(cached.check.apertures).toEqual(fresh.apertures);
	expect(cached.check.summary).toEqual(fresh.summary);
	expect(cached.advice()).toEqual(stencilAdvice(fresh));
	expect(JSON.parse(cached.rowsJson())).toEqual(
		JSON.parse(JSON.stringify({ apertures: fresh.apertures }))
	);

	const answer = JSON.parse(cached.columnsJson()) as StencilColumnsAnswer;
	expect(answer.count).toBe(3);
	const { skipped: _skipped, ...layers } = mapLayers(fresh.apertures);
	expect(answer.map).toEqual(JSON.parse(JSON.stringify(layers)));
	fresh.apertures.forEach((a, i) => {
		const row = columnRow(answer.columns, i);
		expect(row.id).toBe(a.id);
		expect(row.status).toBe(a.status);
		expect(row.areaRatio).toBe(a.areaRatio);
		expect(row.reasons).toEqual(a.reasons.map((r) => ({ limit: r.limit, shortBy: r.shortBy })));
		expect(row.diameterUm).toBe(a.diameterUm);
	});
	// 300 / 480 = 0.625: short of 0.66 by 0.035.
	expect(columnRow(answer.columns, 0).reasons[0].shortBy).toBeCloseTo(0.66 - 0.625, 12);
});

it('reuses one evaluation until the apertures or the thresholds change', () => {
	const id = stencilWith([square('R1', 300, 0), square('R2', 400, 1000)]);
	const first = cachedStencil(db, id);
	expect(cachedStencil(db, id).columnsJson()).toBe(first.columnsJson());
	expect(cachedStencil(db, id).check.apertures).toBe(first.check.apertures);

	// An aperture added: counted at once.
	importApertures(db, id, [square('R3', 500, 2000)], { source: 'json', mode: 'append' }, engineer);
	const added = cachedStencil(db, id);
	expect(added.check.summary.total).toBe(3);

	// One removed and another added (same count): the new row id tells them apart.
	const r1 = added.check.apertures.find((a) => a.refdes === 'R1')!;
	deleteAperture(db, id, r1.id, engineer);
	importApertures(db, id, [square('R4', 300, 3000)], { source: 'json', mode: 'append' }, engineer);
	const swapped = cachedStencil(db, id);
	expect(swapped.check.apertures.map((a) => a.refdes)).toEqual(['R2', 'R3', 'R4']);

	// The site lowers its area-ratio limit to 0.6: R4 (0.625) passes now.
	expect(swapped.check.summary.failCount).toBe(1);
	const next = siteThresholds(db);
	next['laser-stainless'] = { ...next['laser-stainless'], minAreaRatio: 0.6 };
	saveSiteThresholds(db, next, engineer);
	expect(cachedStencil(db, id).check.summary.failCount).toBe(0);
});
