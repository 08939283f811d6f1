import { readFileSync } from 'node:fs';
import { count, eq } from 'drizzle-orm';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { apertureImports, apertures, auditLog } from '../db/schema';
import type { Actor } from '$lib/access';
import type { ApertureInput } from '$lib/stencil';
import {
	ApertureImportError,
	DuplicateStencilError,
	StencilNotFoundError,
	checkSiteThresholds,
	checkStoredStencil,
	compareStoredRevisions,
	createRevision,
	createStencil,
	demoPb100Apertures,
	getStencil,
	importApertures,
	listImports,
	listRevisions,
	listStencils,
	loadApertures,
	saveSiteThresholds,
	seedDemoStencils,
	siteThresholds,
	stencilAdvice,
	thresholdsUpdate
} from './index';

// Worked examples with their sources (IPC-7525 limits; first-principles arithmetic).
const worked = JSON.parse(readFileSync('reference/stencil/worked-examples.json', 'utf8')) as {
	issueExamples: {
		cases: {
			name: string;
			lengthUm: number;
			widthUm: number;
			atThickness: {
				thicknessUm: number;
				areaRatio: number;
				aspectRatio: number;
				status: string;
			}[];
		}[];
	};
};

const engineer: Actor = { kind: 'user', id: 1, email: 'e@x', name: 'E', role: 'engineer' };
let db: Db;
let close: () => void;

beforeEach(() => {
	const t = openTestDatabase();
	db = t.db;
	close = t.close;
	// Audit rows reference users; a real user row keeps foreign keys honest.
	db.$client
		.prepare(
			"insert into users (id, email, name, role, password_hash) values (1, 'e@x', 'E', 'engineer', 'x')"
		)
		.run();
});
afterEach(() => close());

const rect = (refdes: string, pad: string, l: number, w: number, x = 0, y = 0): ApertureInput => ({
	refdes,
	pad,
	shape: 'rectangle',
	lengthUm: l,
	widthUm: w,
	xUm: x,
	yUm: y,
	rotationDeg: 0
});

function newStencil(thicknessUm = 127, revision = 'A') {
	return createStencil(
		db,
		{ name: 'ST-T1', revision, thicknessUm, technology: 'laser-stainless' },
		engineer
	);
}

describe('stencils', () => {
	it('creates, lists and refuses a duplicate name + revision', () => {
		const s = newStencil();
		expect(s).toMatchObject({ name: 'ST-T1', revision: 'A', thicknessUm: 127, apertureCount: 0 });
		expect(listStencils(db).map((x) => x.id)).toEqual([s.id]);
		expect(() => newStencil()).toThrow(DuplicateStencilError);
		expect(() => getStencil(db, 999)).toThrow(StencilNotFoundError);
		const audits = db.select().from(auditLog).where(eq(auditLog.entity, 'stencil')).all();
		expect(audits.map((a) => a.action)).toEqual(['create']);
	});

	it('keeps step regions and applies them when evaluating', () => {
		const s = createStencil(
			db,
			{
				name: 'ST-STEP',
				revision: 'A',
				thicknessUm: 150,
				technology: 'step',
				stepRegions: [{ xMinUm: 0, yMinUm: 0, xMaxUm: 1000, yMaxUm: 1000, thicknessUm: 100 }]
			},
			engineer
		);
		importApertures(
			db,
			s.id,
			[rect('U1', '1', 1000, 200, 500, 500), rect('U1', '2', 1000, 200, 5000, 5000)],
			{ source: 'json', mode: 'append' },
			engineer
		);
		const check = checkStoredStencil(db, s.id);
		expect(check.apertures.map((a) => a.thicknessUm)).toEqual([100, 150]);
		// 0.2 × 1.0 mm: AR = 83.333/T (worked-examples.json) → 0.833 inside, 0.556 outside.
		expect(check.apertures[0].areaRatio).toBeCloseTo(200000 / (2400 * 100), 12);
		expect(check.apertures.map((a) => a.status)).toEqual(['pass', 'fail']);
	});
});

describe('importApertures', () => {
	it('stores apertures and evaluates them against the worked examples (IPC-7525 limits)', () => {
		for (const c of worked.issueExamples.cases.filter((c) => c.lengthUm && c.widthUm))
			for (const at of c.atThickness) {
				const s = createStencil(
					db,
					{
						name: c.name,
						revision: String(at.thicknessUm),
						thicknessUm: at.thicknessUm,
						technology: 'laser-stainless'
					},
					engineer
				);
				importApertures(
					db,
					s.id,
					[rect('X1', '1', c.lengthUm, c.widthUm)],
					{
						source: 'json',
						mode: 'append'
					},
					engineer
				);
				const [a] = checkStoredStencil(db, s.id).apertures;
				expect(a.areaRatio, `${c.name} at ${at.thicknessUm}`).toBeCloseTo(at.areaRatio, 5);
				expect(a.aspectRatio).toBeCloseTo(at.aspectRatio, 5);
				expect(a.status).toBe(at.status);
			}
	});

	it('round-trips every shape and leaves unused fields out', () => {
		const s = newStencil();
		const input: ApertureInput[] = [
			rect('U1', '1', 1000, 200, 10, 20),
			{
				...rect('C1', '1', 300, 280, 0, 0),
				shape: 'rounded-rectangle',
				cornerRadiusUm: 50,
				rotationDeg: 90
			},
			{ refdes: 'U7', pad: 'A1', shape: 'circle', diameterUm: 250, xUm: 1, yUm: 2, rotationDeg: 0 },
			{
				refdes: 'Q1',
				pad: '3',
				shape: 'polygon',
				verticesUm: [
					[-500, -300],
					[500, -300],
					[500, 300],
					[0, 600],
					[-500, 300]
				],
				xUm: 50000,
				yUm: 5000,
				rotationDeg: 0
			}
		];
		const summary = importApertures(db, s.id, input, { source: 'json', mode: 'append' }, engineer);
		expect(summary).toMatchObject({ count: 4, totalApertures: 4, source: 'json', warnings: [] });
		const back = loadApertures(db, s.id).map(
			({ id, ...rest }) => (expect(id).toBeGreaterThan(0), rest)
		);
		expect(back).toEqual(input);
		expect('diameterUm' in back[0]).toBe(false);
	});

	it('refuses the whole import when one aperture is bad, storing nothing', () => {
		const s = newStencil();
		const bad: ApertureInput[] = [
			rect('U1', '1', 1000, 200),
			{ ...rect('U1', '2', 300, 200), shape: 'rounded-rectangle', cornerRadiusUm: 150 }
		];
		let error: unknown;
		try {
			importApertures(db, s.id, bad, { source: 'json', mode: 'append' }, engineer);
		} catch (e) {
			error = e;
		}
		expect(error).toBeInstanceOf(ApertureImportError);
		const problems = (error as ApertureImportError).problems;
		expect(problems[0].where).toBe('U1.2');
		expect(problems[0].field).toBe('cornerRadiusUm');
		expect(db.select({ n: count() }).from(apertures).get()!.n).toBe(0);
		expect(listImports(db, s.id)).toEqual([]);
	});

	it.each([
		['empty list', [] as ApertureInput[], 'holds no apertures'],
		['zero width', [rect('A', '1', 100, 0)], 'widthUm'],
		['NaN length', [rect('A', '1', Number.NaN, 100)], 'lengthUm']
	])('refuses %s', (_name, list, text) => {
		const s = newStencil();
		expect(() =>
			importApertures(db, s.id, list, { source: 'json', mode: 'append' }, engineer)
		).toThrow(text);
	});

	it('appends by default and replaces when asked; unknown stencil is an error', () => {
		const s = newStencil();
		importApertures(
			db,
			s.id,
			[rect('A', '1', 500, 500)],
			{ source: 'csv', mode: 'append', unit: 'mm' },
			engineer
		);
		const second = importApertures(
			db,
			s.id,
			[rect('B', '1', 500, 500)],
			{ source: 'json', mode: 'append' },
			engineer
		);
		expect(second.totalApertures).toBe(2);
		const third = importApertures(
			db,
			s.id,
			[rect('C', '1', 500, 500)],
			{ source: 'json', mode: 'replace' },
			engineer
		);
		expect(third.totalApertures).toBe(1);
		expect(loadApertures(db, s.id).map((a) => a.refdes)).toEqual(['C']);
		expect(listImports(db, s.id).map((i) => i.mode)).toEqual(['replace', 'append', 'append']);
		expect(() =>
			importApertures(
				db,
				999,
				[rect('A', '1', 500, 500)],
				{ source: 'json', mode: 'append' },
				engineer
			)
		).toThrow(StencilNotFoundError);
		expect(db.select({ n: count() }).from(apertureImports).get()!.n).toBe(3);
	});
});

describe('site thresholds', () => {
	it('default to IPC-7525 (0.66 / 1.5) and an override changes the verdict on read', () => {
		expect(siteThresholds(db)['laser-stainless']).toEqual({
			minAreaRatio: 0.66,
			minAspectRatio: 1.5
		});
		const s = newStencil(127);
		// 0201 280 × 300 µm at 127 µm: AR = 84000 / (1160 × 127) = 0.570 (first principles).
		importApertures(
			db,
			s.id,
			[rect('R1', '1', 300, 280)],
			{ source: 'json', mode: 'append' },
			engineer
		);
		expect(checkStoredStencil(db, s.id).apertures[0].status).toBe('fail');
		const all = siteThresholds(db);
		saveSiteThresholds(
			db,
			{ ...all, 'laser-stainless': { minAreaRatio: 0.55, minAspectRatio: 1.5 } },
			engineer
		);
		expect(siteThresholds(db)['laser-stainless'].minAreaRatio).toBe(0.55);
		expect(siteThresholds(db).electroformed.minAreaRatio).toBe(0.66);
		expect(checkStoredStencil(db, s.id).apertures[0].status).toBe('pass');
	});

	it('the API update: a partial body changes only what it names, and is audited when saved', () => {
		const current = siteThresholds(db);
		const update = thresholdsUpdate(current, {
			thresholds: { electroformed: { minAreaRatio: 0.55 } }
		});
		expect(update).toEqual({
			thresholds: { ...current, electroformed: { minAreaRatio: 0.55, minAspectRatio: 1.5 } }
		});
		if (!('thresholds' in update)) throw new Error('expected valid thresholds');
		saveSiteThresholds(db, update.thresholds, engineer);
		expect(siteThresholds(db).electroformed).toEqual({ minAreaRatio: 0.55, minAspectRatio: 1.5 });
		const audit = db.select().from(auditLog).where(eq(auditLog.entity, 'setting')).all();
		expect(audit.map((a) => [a.action, a.entityId])).toEqual([['update', 'stencil.thresholds']]);
	});

	it('the API update names every bad field and saves nothing', () => {
		const current = siteThresholds(db);
		expect(
			thresholdsUpdate(current, {
				thresholds: {
					electroformed: { minAreaRatio: 0, minAspectRatio: 'high' },
					plastic: { minAreaRatio: 0.5 },
					step: { minAreaRatio: 0.6, maxAreaRatio: 2 },
					'laser-stainless': { minAspectRatio: 12 }
				}
			})
		).toEqual({
			errors: [
				{ field: 'thresholds.plastic', message: expect.stringContaining('unknown technology') },
				{
					field: 'thresholds.step.maxAreaRatio',
					message: expect.stringContaining('unknown limit')
				},
				{ field: 'thresholds.laser-stainless.minAspectRatio', message: 'must be at most 10' },
				{ field: 'thresholds.electroformed.minAreaRatio', message: 'must be greater than 0' },
				{ field: 'thresholds.electroformed.minAspectRatio', message: expect.any(String) }
			]
		});
		for (const body of [null, [], { thresholds: 3 }, { electroformed: { minAreaRatio: 0.5 } }])
			expect(thresholdsUpdate(current, body)).toEqual({
				errors: [{ field: 'thresholds', message: expect.stringContaining('"thresholds"') }]
			});
		expect(thresholdsUpdate(current, { thresholds: { step: 0.5 } })).toEqual({
			errors: [{ field: 'thresholds.step', message: expect.stringContaining('must be an object') }]
		});
		expect(siteThresholds(db)).toEqual(current);
	});

	it('the page and the API share one check of the complete set', () => {
		const all = siteThresholds(db);
		expect(checkSiteThresholds({ ...all, step: { minAreaRatio: 0, minAspectRatio: 1.5 } })).toEqual(
			{
				errors: [{ field: 'step.minAreaRatio', message: 'must be greater than 0' }]
			}
		);
		expect(checkSiteThresholds(all)).toEqual({ thresholds: all });
	});

	it.each([0, -1, 11, Number.NaN])('refuses an area-ratio limit of %s', (v) => {
		const all = siteThresholds(db);
		expect(() =>
			saveSiteThresholds(db, { ...all, step: { minAreaRatio: v, minAspectRatio: 1.5 } }, engineer)
		).toThrow('minAreaRatio');
	});
});

describe('revisions', () => {
	it('a new revision copies apertures and regions and compares against the old one', () => {
		const a = newStencil(127, 'A');
		importApertures(
			db,
			a.id,
			[rect('U1', '1', 1000, 200, 0, 0), rect('U1', '2', 1000, 200, 0, 400)],
			{ source: 'json', mode: 'append' },
			engineer
		);
		const b = createRevision(
			db,
			a.id,
			{ revision: 'B', thicknessUm: 100, technology: 'laser-stainless' },
			engineer
		);
		expect(b).toMatchObject({
			name: 'ST-T1',
			revision: 'B',
			basedOnStencilId: a.id,
			apertureCount: 2
		});
		expect(() =>
			createRevision(
				db,
				a.id,
				{ revision: 'B', thicknessUm: 100, technology: 'laser-stainless' },
				engineer
			)
		).toThrow(DuplicateStencilError);
		expect(listRevisions(db, 'ST-T1').map((s) => s.revision)).toEqual(['A', 'B']);
		importApertures(
			db,
			b.id,
			[rect('U1', '1', 1000, 250, 0, 0)],
			{ source: 'json', mode: 'replace' },
			engineer
		);
		const { comparison } = compareStoredRevisions(db, a.id, b.id);
		expect(comparison.removed.map((r) => r.aperture.pad)).toEqual(['2']);
		// The width changed, and with it and the foil (127 → 100 µm) both ratios (da2329e: a
		// ratio change marks the pair changed).
		expect(comparison.changed[0].fields).toEqual(['widthUm', 'areaRatio', 'aspectRatio']);
		// 0.25 × 1.0 mm at 100 µm: 250000 / (2500 × 100) = 1.0; old 0.2 × 1.0 at 127: 83.333/127.
		expect(comparison.changed[0].new.areaRatio).toBeCloseTo(1.0, 12);
		expect(comparison.changed[0].old.areaRatio).toBeCloseTo(200000 / (2400 * 127), 12);
	});
});

describe('demo stencils', () => {
	it('rev A fails the 0201s, QFN and BGA; rev B steps the BGA down so it passes', () => {
		seedDemoStencils(db);
		const [a, b] = listRevisions(db, 'ST-PB100');
		const checkA = checkStoredStencil(db, a.id);
		const failing = new Set(
			checkA.apertures.filter((x) => x.status === 'fail').map((x) => x.refdes.replace(/\d+$/, ''))
		);
		expect([...failing].sort()).toEqual(['R', 'U']);
		expect(checkA.apertures.length).toBeGreaterThan(200);
		const u2b = checkStoredStencil(db, b.id).apertures.filter((x) => x.refdes === 'U2');
		expect(u2b.every((x) => x.thicknessUm === 100 && x.status === 'pass')).toBe(true);
		// D/4T = 300 / 400 = 0.75 (circle, first principles).
		expect(u2b[0].areaRatio).toBeCloseTo(0.75, 12);
		const advice = stencilAdvice(checkA);
		expect(advice.sweep.series.some((p) => p.thicknessUm === 127)).toBe(true);
		// Narrowest opening 220 µm (U1): Type 4 needs 5 × 38 = 190 ≤ 220; Type 3 needs 225.
		expect(advice.powder.type).toBe(4);
	});

	it('20,000 apertures: import and evaluation on read stay fast (figures printed)', () => {
		const s = newStencil();
		const base = demoPb100Apertures();
		const many: ApertureInput[] = [];
		for (let k = 0; many.length < 20_000; k++)
			for (const a of base)
				if (many.length < 20_000)
					many.push({
						...a,
						xUm: a.xUm + (k % 10) * 100_000,
						yUm: a.yUm + Math.floor(k / 10) * 100_000
					});
		let t = performance.now();
		importApertures(db, s.id, many, { source: 'json', mode: 'append' }, engineer);
		const importMs = performance.now() - t;
		t = performance.now();
		const check = checkStoredStencil(db, s.id);
		const readMs = performance.now() - t;
		t = performance.now();
		stencilAdvice(check);
		const adviceMs = performance.now() - t;
		t = performance.now();
		const body = JSON.stringify({ apertures: check.apertures });
		const jsonMs = performance.now() - t;
		console.log(
			`[bench] 20k apertures: import ${importMs.toFixed(0)} ms, load+evaluate ${readMs.toFixed(0)} ms, ` +
				`sweep+powder ${adviceMs.toFixed(0)} ms, JSON ${jsonMs.toFixed(0)} ms (${(body.length / 1e6).toFixed(1)} MB)`
		);
		expect(check.apertures).toHaveLength(20_000);
		expect(check.summary.total).toBe(20_000);
	}, 60_000);
});
