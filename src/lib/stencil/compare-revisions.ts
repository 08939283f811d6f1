/**
 * Compare two stencil revisions aperture by aperture: what was added, removed or changed.
 */
import { effectiveShape, type ApertureInput } from './aperture';
import { apertureGeometry, type ApertureGeometry } from './geometry';
import { areaRatio, aspectRatio } from './area-ratio';
import { validApertureCentreUm } from './outline';
import { StencilInputError, type InputProblem } from './stencil-input-error';

/** Options of `compareRevisions`. */
export interface CompareRevisionsOptions {
	/** Foil thickness of the old and the new revision, µm (for the ratios of changed apertures). */
	oldThicknessUm: number;
	newThicknessUm: number;
	/** Unnamed or unmatched apertures pair up when their centres are this close; default 50 µm. */
	positionToleranceUm?: number;
	/** Sizes and positions closer than this count as equal, µm; default 0.5 µm. */
	sizeToleranceUm?: number;
	/** Technology of each revision (e.g. laser-cut, electroformed); a change is reported. */
	oldTechnology?: string;
	newTechnology?: string;
}

/** A stencil-level difference (foil thickness, technology). */
export interface StencilChange {
	field: 'thicknessUm' | 'technology';
	old: number | string;
	new: number | string;
}

/** The ratios and sizes of one side of a changed pair. */
export interface RevisionSide {
	index: number;
	aperture: ApertureInput;
	areaUm2: number;
	minDimensionUm: number;
	areaRatio: number;
	aspectRatio: number;
}

/** A matched pair whose geometry differs; `fields` names what changed. */
export interface ChangedAperture {
	matchedBy: 'refdes-pad' | 'position';
	fields: string[];
	old: RevisionSide;
	new: RevisionSide;
}

/** Result of `compareRevisions`. */
export interface RevisionComparison {
	added: { index: number; aperture: ApertureInput }[];
	removed: { index: number; aperture: ApertureInput }[];
	changed: ChangedAperture[];
	unchangedCount: number;
	/** Foil thickness or technology changes (each changes every aperture's print, not its cut). */
	stencilChanges: StencilChange[];
	/** Set when matching by position was cut short (see `MAX_POSITION_TESTS`). */
	note?: string;
}

/** Most centre-distance tests spent on matching by position (see `compareRevisions`). */
export const MAX_POSITION_TESTS = 20_000_000;

const key = (a: ApertureInput) => `${a.refdes}\u0000${a.pad}`;

function differences(
	a: ApertureInput,
	b: ApertureInput,
	tol: number,
	[ax, ay]: [number, number],
	[bx, by]: [number, number]
): string[] {
	const fields: string[] = [];
	const near = (x?: number, y?: number) => Math.abs((x ?? 0) - (y ?? 0)) <= tol;
	const sa = effectiveShape(a);
	const sb = effectiveShape(b);
	if (sa !== sb) fields.push('shape');
	else if (sa === 'circle') {
		if (!near(a.diameterUm, b.diameterUm)) fields.push('diameterUm');
	} else if (sa === 'polygon') {
		const va = a.verticesUm!;
		const vb = b.verticesUm!;
		const same = (p: [number, number], i: number) => near(p[0], vb[i][0]) && near(p[1], vb[i][1]);
		if (va.length !== vb.length || !va.every(same)) fields.push('verticesUm');
	} else {
		if (!near(a.lengthUm, b.lengthUm)) fields.push('lengthUm');
		if (!near(a.widthUm, b.widthUm)) fields.push('widthUm');
		if (!near(a.cornerRadiusUm, b.cornerRadiusUm)) fields.push('cornerRadiusUm');
	}
	if (Math.hypot(ax - bx, ay - by) > tol) fields.push('position');
	// A rectangle turned by 180° is the same opening; a polygon needs a full turn; a circle any.
	const period = sa === 'polygon' ? 360 : 180;
	const turn = (((a.rotationDeg - b.rotationDeg) % period) + period) % period;
	if (sa !== 'circle' && Math.min(turn, period - turn) > 1e-6) fields.push('rotationDeg');
	return fields;
}

function side(
	index: number,
	aperture: ApertureInput,
	g: ApertureGeometry,
	thicknessUm: number
): RevisionSide {
	return {
		index,
		aperture,
		areaUm2: g.areaUm2,
		minDimensionUm: g.minDimensionUm,
		areaRatio: areaRatio(g.areaUm2, g.perimeterUm, thicknessUm),
		aspectRatio: aspectRatio(g.minDimensionUm, thicknessUm)
	};
}

/**
 * Match apertures of two revisions, first by refdes + pad (both non-empty; the first
 * occurrence of a duplicate name), then the rest by nearest centre within the position
 * tolerance. A pair is "changed" when its geometry differs (shape, size, position, rotation)
 * or one of its ratios does (`areaRatio`, `aspectRatio`: a foil thickness change alone changes
 * every ratio, so every matched aperture is changed); thickness and technology changes are also
 * listed once in `stencilChanges`.
 * O(n) via hashing and a position grid.
 * @throws {StencilInputError} for invalid apertures, thicknesses or tolerances.
 * @example compareRevisions(revA, revB, { oldThicknessUm: 120, newThicknessUm: 100 }).changed.length
 */
export function compareRevisions(
	oldApertures: readonly ApertureInput[],
	newApertures: readonly ApertureInput[],
	options: CompareRevisionsOptions
): RevisionComparison {
	const posTol = options.positionToleranceUm ?? 50;
	const sizeTol = options.sizeToleranceUm ?? 0.5;
	const problems: InputProblem[] = (
		[
			['oldThicknessUm', options.oldThicknessUm],
			['newThicknessUm', options.newThicknessUm],
			['positionToleranceUm', posTol]
		] as const
	)
		.filter(([, v]) => !Number.isFinite(v) || v <= 0)
		.map(([field, v]) => ({
			where: 'revision comparison',
			field,
			message: `must be a finite number greater than 0 (got ${v})`
		}));
	if (!Number.isFinite(sizeTol) || sizeTol < 0)
		problems.push({
			where: 'revision comparison',
			field: 'sizeToleranceUm',
			message: `must be a finite number ≥ 0 (got ${sizeTol})`
		});
	if (problems.length > 0) throw new StencilInputError(problems);
	// Checked and measured once each; centres and figures below reuse it.
	const oldGeometry = oldApertures.map((a, i) => apertureGeometry(a, i));
	const newGeometry = newApertures.map((a, i) => apertureGeometry(a, i));
	const newCentres = newApertures.map((a) => validApertureCentreUm(a));

	const pairs: [number, number, 'refdes-pad' | 'position'][] = [];
	const oldUsed = new Array<boolean>(oldApertures.length).fill(false);
	const newUsed = new Array<boolean>(newApertures.length).fill(false);
	const byName = new Map<string, number>();
	oldApertures.forEach((a, i) => {
		if (a.refdes && a.pad && !byName.has(key(a))) byName.set(key(a), i);
	});
	newApertures.forEach((b, j) => {
		if (!b.refdes || !b.pad) return;
		const i = byName.get(key(b));
		if (i !== undefined && !oldUsed[i]) {
			oldUsed[i] = newUsed[j] = true;
			pairs.push([i, j, 'refdes-pad']);
		}
	});

	// Position matching of the leftovers: each new aperture takes the nearest free old one.
	const grid = new Map<string, number[]>();
	const oldCentres = oldApertures.map((a) => validApertureCentreUm(a));
	oldCentres.forEach(([x, y], i) => {
		if (oldUsed[i]) return;
		const k = `${Math.floor(x / posTol)},${Math.floor(y / posTol)}`;
		const list = grid.get(k);
		if (list) list.push(i);
		else grid.set(k, [i]);
	});
	// Apertures piled within one tolerance cell would make matching quadratic: it stops after
	// MAX_POSITION_TESTS distance tests and says so.
	let tests = 0;
	let stoppedAt: number | null = null;
	newApertures.forEach((b, j) => {
		if (newUsed[j] || stoppedAt !== null) return;
		if (tests > MAX_POSITION_TESTS) {
			stoppedAt = j;
			return;
		}
		const [x, y] = newCentres[j];
		const gx = Math.floor(x / posTol);
		const gy = Math.floor(y / posTol);
		let best = -1;
		let bestD = Infinity;
		for (let dx = -1; dx <= 1 && bestD > 0; dx++)
			for (let dy = -1; dy <= 1 && bestD > 0; dy++) {
				const list = grid.get(`${gx + dx},${gy + dy}`);
				if (!list) continue;
				// Taken apertures leave their cell, so crowded cells shrink as they are matched.
				for (let k = list.length - 1; k >= 0; k--) {
					const i = list[k];
					if (oldUsed[i]) {
						list[k] = list[list.length - 1];
						list.pop();
						continue;
					}
					const d = Math.hypot(oldCentres[i][0] - x, oldCentres[i][1] - y);
					tests++;
					if (d <= posTol && (d < bestD || (d === bestD && i < best))) {
						best = i;
						bestD = d;
						if (d === 0) break;
					}
				}
			}
		if (best >= 0) {
			oldUsed[best] = newUsed[j] = true;
			pairs.push([best, j, 'position']);
		}
	});

	const changed: ChangedAperture[] = [];
	let unchangedCount = 0;
	// Ratios equal to this relative difference are the same (only rounding differs).
	const sameRatio = (a: number, b: number) =>
		Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b));
	for (const [i, j, matchedBy] of pairs) {
		const fields = differences(
			oldApertures[i],
			newApertures[j],
			sizeTol,
			oldCentres[i],
			newCentres[j]
		);
		const before = side(i, oldApertures[i], oldGeometry[i], options.oldThicknessUm);
		const after = side(j, newApertures[j], newGeometry[j], options.newThicknessUm);
		if (!sameRatio(before.areaRatio, after.areaRatio)) fields.push('areaRatio');
		if (!sameRatio(before.aspectRatio, after.aspectRatio)) fields.push('aspectRatio');
		if (fields.length === 0) unchangedCount++;
		else changed.push({ matchedBy, fields, old: before, new: after });
	}
	const stencilChanges: StencilChange[] = [];
	if (Math.abs(options.oldThicknessUm - options.newThicknessUm) > sizeTol) {
		stencilChanges.push({
			field: 'thicknessUm',
			old: options.oldThicknessUm,
			new: options.newThicknessUm
		});
	}
	const tech = (t?: string) => (t ?? '').trim().toLowerCase();
	if (tech(options.oldTechnology) !== tech(options.newTechnology)) {
		stencilChanges.push({
			field: 'technology',
			old: options.oldTechnology ?? '',
			new: options.newTechnology ?? ''
		});
	}
	changed.sort((p, q) => p.new.index - q.new.index);
	return {
		added: newApertures.flatMap((aperture, index) => (newUsed[index] ? [] : [{ index, aperture }])),
		removed: oldApertures.flatMap((aperture, index) =>
			oldUsed[index] ? [] : [{ index, aperture }]
		),
		changed,
		unchangedCount,
		stencilChanges,
		...(stoppedAt !== null
			? {
					note:
						`matching by position stopped at new aperture #${(stoppedAt as number) + 1} after ` +
						`${MAX_POSITION_TESTS} distance tests (apertures piled on one spot); ` +
						'the rest are listed as added or removed'
				}
			: {})
	};
}
