/**
 * Validation of one aperture's numbers before any computation, so bad input gives a clear
 * message instead of NaN results or a crash.
 */
import { APERTURE_SHAPES, apertureLabel, type ApertureInput } from './aperture';
import { describeValue, type InputProblem } from './stencil-input-error';
import { findSelfIntersection, openPolygon, polygonAreaUm2 } from './polygon';
import { DEFAULT_STENCIL_LIMITS, NUMBER_RANGES, RELATIVE_TOLERANCE, formatCount } from './limits';

/**
 * Largest accepted aperture dimension, 100 mm: far above any real SMT aperture (large
 * through-hole-reflow or shield-can openings are a few tens of mm), so a larger value is almost
 * certainly a unit mistake (e.g. µm entered as nm).
 */
export const MAX_APERTURE_DIMENSION_UM = NUMBER_RANGES.maxApertureSizeUm;

/** Smallest accepted aperture dimension, 1 µm: no foil is cut finer. */
export const MIN_APERTURE_DIMENSION_UM = NUMBER_RANGES.minApertureSizeUm;

/** Largest accepted |x| or |y| of an aperture position, 2 m: beyond any stencil frame. */
export const MAX_POSITION_UM = NUMBER_RANGES.maxPositionUm;

/** Largest accepted |rotation|, degrees: one turn either way. */
export const MAX_ROTATION_DEG = NUMBER_RANGES.maxRotationDeg;

type Problems = InputProblem[];

function checkFinite(value: unknown, where: string, field: string, problems: Problems): boolean {
	if (typeof value !== 'number' || !Number.isFinite(value)) {
		problems.push({
			where,
			field,
			message: `must be a finite number (got ${describeValue(value)})`
		});
		return false;
	}
	return true;
}

function checkSize(value: unknown, where: string, field: string, problems: Problems): boolean {
	if (!checkFinite(value, where, field, problems)) return false;
	const v = value as number;
	if (v <= 0) {
		problems.push({ where, field, message: `must be greater than 0 µm (got ${v})` });
		return false;
	}
	if (v < MIN_APERTURE_DIMENSION_UM) {
		const message = `${v} µm is below the ${MIN_APERTURE_DIMENSION_UM} µm minimum; check the unit`;
		problems.push({ where, field, message });
		return false;
	}
	if (v > MAX_APERTURE_DIMENSION_UM) {
		problems.push({
			where,
			field,
			message:
				`${v} µm exceeds the ${MAX_APERTURE_DIMENSION_UM} µm (100 mm) limit; ` + 'check the unit'
		});
		return false;
	}
	return true;
}

function checkPolygon(
	vertices: unknown,
	where: string,
	problems: Problems,
	maxVertices: number,
	outlineCrossing: boolean
): void {
	const field = 'verticesUm';
	if (!Array.isArray(vertices)) {
		problems.push({ where, field, message: 'a polygon needs a list of [x, y] vertices' });
		return;
	}
	// Counted before any per-vertex work, so an oversized outline costs nothing.
	if (vertices.length > maxVertices) {
		problems.push({
			where,
			field,
			message:
				`the outline has ${formatCount(vertices.length)} vertices; ` +
				`the limit is ${formatCount(maxVertices)} per outline`
		});
		return;
	}
	let ok = true;
	vertices.forEach((v, k) => {
		const isPair =
			Array.isArray(v) &&
			v.length === 2 &&
			v.every((c) => typeof c === 'number' && Number.isFinite(c));
		if (!isPair) {
			problems.push({
				where,
				field: `${field}[${k}]`,
				message: `must be a pair of finite numbers [x, y] (got ${describeValue(v)})`
			});
			ok = false;
		} else if (
			Math.abs(v[0]) > MAX_APERTURE_DIMENSION_UM ||
			Math.abs(v[1]) > MAX_APERTURE_DIMENSION_UM
		) {
			problems.push({
				where,
				field: `${field}[${k}]`,
				message:
					`vertex lies more than ${MAX_APERTURE_DIMENSION_UM} µm from the aperture position; ` +
					'check the unit'
			});
			ok = false;
		}
	});
	if (!ok) return;
	const pts = openPolygon(vertices as [number, number][]);
	if (pts.length < 3) {
		problems.push({
			where,
			field,
			message: `a polygon needs at least 3 vertices (got ${pts.length})`
		});
		return;
	}
	for (let k = 0; k < pts.length; k++) {
		const next = pts[(k + 1) % pts.length];
		if (pts[k][0] === next[0] && pts[k][1] === next[1]) {
			problems.push({
				where,
				field,
				message: `vertices ${k} and ${(k + 1) % pts.length} are the same point`
			});
			return;
		}
	}
	const crossing = outlineCrossing ? findSelfIntersection(pts) : null;
	if (crossing) {
		problems.push({
			where,
			field,
			message:
				`the outline intersects itself ` +
				`(edges ${crossing[0]} and ${crossing[1]}, counting from 0)`
		});
		return;
	}
	if (polygonAreaUm2(pts) === 0)
		problems.push({ where, field, message: 'the polygon has zero area' });
}

/** Options of `checkAperture`. */
export interface CheckApertureOptions {
	/**
	 * Test polygon outlines for crossing edges (default true). The map turns it off: it draws
	 * apertures the server checked in full when they were stored and again when read.
	 */
	outlineCrossing?: boolean;
}

/**
 * List every problem with an aperture's numbers (empty list = valid). Used by the CSV importer
 * (to report all errors at once) and by `apertureGeometry` (which throws on any).
 *
 * Checks: known shape; finite position (|x|, |y| ≤ 2 m) and rotation (-360..360°); sizes
 * 1 µm..100 mm; corner radius 0 ≤ r ≤ min(L, W)/2 (within a relative 1e-6); polygon 3 to
 * `maxOutlineVertices` distinct vertices, not self-intersecting, non-zero area.
 * @example checkAperture({ refdes: 'R1', pad: '1', shape: 'circle', diameterUm: -1, xUm: 0, yUm: 0, rotationDeg: 0 })
 * // [{ where: 'R1.1', field: 'diameterUm', message: 'must be greater than 0 µm (got -1)' }]
 */
export function checkAperture(
	aperture: ApertureInput,
	index?: number,
	maxOutlineVertices: number = DEFAULT_STENCIL_LIMITS.maxOutlineVertices,
	options: CheckApertureOptions = {}
): InputProblem[] {
	const problems: Problems = [];
	const where = apertureLabel(aperture, index);
	checkFinite(aperture.xUm, where, 'xUm', problems);
	checkFinite(aperture.yUm, where, 'yUm', problems);
	if (
		checkFinite(aperture.rotationDeg, where, 'rotationDeg', problems) &&
		Math.abs(aperture.rotationDeg) > MAX_ROTATION_DEG
	)
		problems.push({
			where,
			field: 'rotationDeg',
			message: `${aperture.rotationDeg}° is outside -${MAX_ROTATION_DEG}..${MAX_ROTATION_DEG}°`
		});
	for (const field of ['xUm', 'yUm'] as const) {
		const v = aperture[field];
		if (Number.isFinite(v) && Math.abs(v) > MAX_POSITION_UM)
			problems.push({
				where,
				field,
				message: `${v} µm is beyond ±${MAX_POSITION_UM} µm; check the unit`
			});
	}
	if (!APERTURE_SHAPES.includes(aperture.shape)) {
		problems.push({
			where,
			field: 'shape',
			message:
				`unknown shape ${describeValue(aperture.shape)}; ` +
				`expected one of ${APERTURE_SHAPES.join(', ')}`
		});
		return problems;
	}
	if (aperture.shape === 'circle') {
		checkSize(aperture.diameterUm, where, 'diameterUm', problems);
	} else if (aperture.shape === 'polygon') {
		const crossing = options.outlineCrossing ?? true;
		checkPolygon(aperture.verticesUm, where, problems, maxOutlineVertices, crossing);
	} else {
		const okL = checkSize(aperture.lengthUm, where, 'lengthUm', problems);
		const okW = checkSize(aperture.widthUm, where, 'widthUm', problems);
		const r = aperture.cornerRadiusUm;
		if (aperture.shape === 'rounded-rectangle' && r === undefined) {
			problems.push({
				where,
				field: 'cornerRadiusUm',
				message: 'a rounded rectangle needs a corner radius'
			});
		} else if (r !== undefined && checkFinite(r, where, 'cornerRadiusUm', problems)) {
			if (r < 0) {
				problems.push({
					where,
					field: 'cornerRadiusUm',
					message: `must not be negative (got ${r})`
				});
			} else if (okL && okW) {
				const half = Math.min(aperture.lengthUm!, aperture.widthUm!) / 2;
				// Relative slack: an inch obround converted to µm may come out a hair over.
				if (r > half * (1 + RELATIVE_TOLERANCE))
					problems.push({
						where,
						field: 'cornerRadiusUm',
						message: `${r} µm exceeds half the smaller side (${half} µm)`
					});
			}
		}
	}
	return problems;
}
