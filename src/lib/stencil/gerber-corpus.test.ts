import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import type { ApertureInput } from './aperture';
import { apertureGeometry } from './geometry';
import { importGerberPasteLayer, type GerberImportSuccess } from './gerber-import';
import { findApertureOverlaps } from './overlaps';

// The corpus of issue 15: reference/gerber/README.md derives every value by hand.
const dir = new URL('../../../reference/gerber/', import.meta.url);
const read = (name: string) => readFileSync(new URL(name, dir), 'utf8');

interface Opening {
	shape: ApertureInput['shape'];
	xUm: number;
	yUm: number;
	areaUm2: number;
	tolUm2?: number;
}
interface Case {
	trap: string;
	units: 'mm' | 'in';
	counts: GerberImportSuccess['counts'];
	drawn?: GerberImportSuccess['drawn'];
	overlaps?: { merged: number; pairs: number; sharedAreaUm2?: number };
	openingCount?: number;
	openings?: Opening[];
	eachDrawnAreaUm2?: number;
	sumAreaUm2?: number;
	unionAreaUm2?: number;
	areaTolUm2?: number;
	warningsContaining?: string[];
}
const expected = JSON.parse(read('expected.json')) as {
	cases: Record<string, Case>;
	failures: Record<string, { trap: string; errorContaining: string[] }>;
};

describe('reference/gerber corpus', () => {
	for (const [file, exp] of Object.entries(expected.cases)) {
		describe(`${file}: ${exp.trap}`, () => {
			const result = importGerberPasteLayer(read(file));
			it('imports', () => expect('errors' in result ? result.errors : []).toEqual([]));
			if ('errors' in result) return;
			const areas = result.apertures.map((a) => apertureGeometry(a).areaUm2);

			it('has the expected units, counts, drawn openings and overlaps', () => {
				expect(result.units).toBe(exp.units);
				expect(result.counts).toEqual(exp.counts);
				if (exp.drawn) expect(result.drawn).toEqual(exp.drawn);
				if (exp.overlaps) {
					expect(result.overlaps.merged).toBe(exp.overlaps.merged);
					expect(result.overlaps.pairs).toBe(exp.overlaps.pairs);
					if (exp.overlaps.sharedAreaUm2 !== undefined)
						expect(result.overlaps.sharedAreaUm2).toBeCloseTo(exp.overlaps.sharedAreaUm2, 3);
				}
				const count = exp.openingCount ?? exp.openings?.length;
				expect(result.apertures.length).toBe(count);
			});

			for (const o of exp.openings ?? []) {
				it(`a ${o.shape} at (${o.xUm}, ${o.yUm}) µm of ${o.areaUm2} µm²`, () => {
					const i = result.apertures.findIndex(
						(a) => Math.abs(a.xUm - o.xUm) < 0.01 && Math.abs(a.yUm - o.yUm) < 0.01
					);
					expect(i).toBeGreaterThanOrEqual(0);
					expect(result.apertures[i].shape).toBe(o.shape);
					expect(Math.abs(areas[i] - o.areaUm2)).toBeLessThanOrEqual(o.tolUm2 ?? 0.01);
				});
			}

			if (exp.eachDrawnAreaUm2 !== undefined) {
				it(`every drawn opening has ${exp.eachDrawnAreaUm2} µm², short by at most 0.5 µm × its perimeter (chords)`, () => {
					const drawn = result.apertures.filter((a) => a.drawn);
					expect(drawn.length).toBe(exp.drawn?.openings);
					for (const a of drawn) {
						const g = apertureGeometry(a);
						expect(g.areaUm2).toBeLessThanOrEqual(exp.eachDrawnAreaUm2! + 0.001);
						expect(exp.eachDrawnAreaUm2! - g.areaUm2).toBeLessThanOrEqual(0.5 * g.perimeterUm);
					}
				});
			}

			if (exp.sumAreaUm2 !== undefined) {
				it('has the expected paste area, summed and as a union', () => {
					const report = findApertureOverlaps(result.apertures, areas);
					expect(Math.abs(report.sumAreaUm2 - exp.sumAreaUm2!)).toBeLessThanOrEqual(
						exp.areaTolUm2 ?? 0.01
					);
					expect(Math.abs(report.unionAreaUm2 - exp.unionAreaUm2!)).toBeLessThanOrEqual(
						exp.areaTolUm2 ?? 0.01
					);
				});
			}

			it('warns as expected', () => {
				const text = result.warnings.join('\n');
				if (!exp.warningsContaining) expect(result.warnings).toEqual([]);
				for (const w of exp.warningsContaining ?? []) expect(text).toContain(w);
			});
		});
	}

	for (const [file, exp] of Object.entries(expected.failures)) {
		it(`${file} (${exp.trap}) fails with a clear error`, () => {
			const result = importGerberPasteLayer(read(file));
			expect('errors' in result).toBe(true);
			if (!('errors' in result)) return;
			const text = result.errors.map((e) => e.message).join('\n');
			for (const w of exp.errorContaining) expect(text).toContain(w);
		});
	}
});
