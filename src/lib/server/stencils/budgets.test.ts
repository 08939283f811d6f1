/**
 * Stencil work budgets on the storing side (issue 11): polygon vertices per import and per
 * stencil are counted before anything is checked or written, and a refused replace leaves the
 * stored apertures as they were; reading a stencil of heavy outlines stays cheap.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import type { Actor } from '$lib/access';
import type { ApertureInput, PointUm } from '$lib/stencil';
import { withLimits } from '$lib/stencil/limits';
import {
	ApertureImportError,
	checkStoredStencil,
	createStencil,
	importApertures,
	loadApertures,
	stencilAdvice,
	storedVertexCount,
	stencilLimitsFromEnv
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

const ring = (n: number, r: number): PointUm[] =>
	Array.from({ length: n }, (_, k) => [
		r * Math.cos((2 * Math.PI * k) / n),
		r * Math.sin((2 * Math.PI * k) / n)
	]);
const polygons = (count: number, vertices: number): ApertureInput[] =>
	Array.from({ length: count }, (_, i) => ({
		refdes: `P${i + 1}`,
		pad: '1',
		shape: 'polygon',
		verticesUm: ring(vertices, 400),
		xUm: i * 1000,
		yUm: 0,
		rotationDeg: 0
	}));
const stencil = () =>
	createStencil(
		db,
		{ name: 'Heavy', revision: 'A', thicknessUm: 120, technology: 'laser-stainless' },
		engineer
	).id;
const problemsOf = (fn: () => unknown) => {
	try {
		fn();
	} catch (e) {
		if (e instanceof ApertureImportError) return e.problems;
		throw e;
	}
	throw new Error('expected an ApertureImportError');
};

describe('importApertures: vertex budgets', () => {
	it('refuses an import over the per-import vertex budget, naming the count and the limit', () => {
		const id = stencil();
		const limits = withLimits({ maxVerticesPerImport: 1_000 });
		const problems = problemsOf(() =>
			importApertures(
				db,
				id,
				polygons(3, 400),
				{ source: 'json', mode: 'append' },
				engineer,
				limits
			)
		);
		expect(problems).toEqual([
			{
				where: 'import',
				field: 'verticesUm',
				message: 'the polygons hold 1,200 vertices; the limit is 1,000 per import'
			}
		]);
		expect(loadApertures(db, id)).toEqual([]);
	});

	it('counts what the stencil already holds; a refused replace leaves the stored apertures unchanged', () => {
		const id = stencil();
		const limits = withLimits({ maxVerticesPerStencil: 1_000 });
		importApertures(db, id, polygons(2, 400), { source: 'json', mode: 'append' }, engineer, limits);
		expect(storedVertexCount(db, id)).toBe(800);
		const before = loadApertures(db, id);
		const problems = problemsOf(() =>
			importApertures(
				db,
				id,
				polygons(1, 400),
				{ source: 'json', mode: 'append' },
				engineer,
				limits
			)
		);
		expect(problems[0].message).toBe(
			'the stencil would hold 1,200 polygon vertices; the limit is 1,000 per stencil'
		);
		// Replacing with a list that has a bad aperture is refused as a whole.
		const bad = [...polygons(1, 400), { ...polygons(1, 400)[0], rotationDeg: 1e308 }];
		expect(
			problemsOf(() =>
				importApertures(db, id, bad, { source: 'json', mode: 'replace' }, engineer, limits)
			)[0]
		).toMatchObject({
			field: 'rotationDeg'
		});
		expect(loadApertures(db, id)).toEqual(before);
		// A replace counts only the new list.
		importApertures(
			db,
			id,
			polygons(2, 450),
			{ source: 'json', mode: 'replace' },
			engineer,
			limits
		);
		expect(storedVertexCount(db, id)).toBe(900);
	});

	it('environment overrides are whole numbers > 0; anything else keeps the default', () => {
		expect(
			stencilLimitsFromEnv({ STENCIL_MAX_VERTICES_PER_STENCIL: '900000' }).maxVerticesPerStencil
		).toBe(900_000);
		const kept = stencilLimitsFromEnv({
			STENCIL_PARSE_TIMEOUT_MS: '1e308',
			STENCIL_PARSE_HEAP_MB: '-5'
		});
		expect(kept.parseDeadlineMs).toBe(30_000);
		expect(kept.parseHeapMb).toBe(512);
	});
});

describe('reading a stencil of heavy outlines', () => {
	it('500 polygons of 1,000 vertices (the per-stencil default budget) read with correct figures', () => {
		const id = stencil();
		importApertures(db, id, polygons(500, 1_000), { source: 'json', mode: 'append' }, engineer);
		const check = checkStoredStencil(db, id);
		const advice = stencilAdvice(check);
		// A regular 1,000-gon of circumradius 400 µm: area ½·n·r²·sin(2π/n), width 2r·cos(π/n).
		const n = 1000;
		const area = 0.5 * n * 400 * 400 * Math.sin((2 * Math.PI) / n);
		expect(check.apertures).toHaveLength(500);
		expect(check.apertures[0].areaUm2).toBeCloseTo(area, 6);
		expect(check.apertures[0].minDimensionUm).toBeCloseTo(800 * Math.cos(Math.PI / n), 6);
		expect(advice.powder.limitingMinDimensionUm).toBeCloseTo(800 * Math.cos(Math.PI / n), 6);
		expect(advice.sweep.series.every((p) => p.total === 500)).toBe(true);
	});
});

describe('rows stored before the rotation range', () => {
	it('a stored rotation of 450° or 1e308° reads as the same turn inside ±360°, so the stencil stays readable', () => {
		const id = stencil();
		importApertures(db, id, polygons(2, 8), { source: 'json', mode: 'append' }, engineer);
		db.$client.prepare('update apertures set rotation_deg = 450 where refdes = ?').run('P1');
		db.$client.prepare('update apertures set rotation_deg = 1e308 where refdes = ?').run('P2');
		const read = loadApertures(db, id);
		expect(read[0].rotationDeg).toBe(90);
		expect(Math.abs(read[1].rotationDeg)).toBeLessThan(360);
		expect(read[1].rotationDeg).toBe(1e308 % 360);
		expect(checkStoredStencil(db, id).apertures).toHaveLength(2);
	});
});
