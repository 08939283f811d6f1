/**
 * Flatten a plotted Gerber region path (line and arc segments) into closed polygon contours.
 * Arcs are replaced by chords whose vertices lie on the arc, so a flattened convex arc loses at
 * most the circular-segment area between chord and arc: with sagitta s ≤ tolerance, the error
 * per chord is below (2/3)·s·chord length (area of a parabolic segment, first principles).
 */
import type { GerberPathSegment, GerberPoint } from './gerber-types';
import { formatCount, StencilBudgetError } from './limits';

/** Coordinates closer than this (file units, i.e. 1 pm in mm) are the same point. */
const SAME_POINT = 1e-9;

/** Longest chord angle allowed, so even a huge tolerance keeps 8 chords per full circle. */
const MAX_CHORD_ANGLE_RAD = Math.PI / 4;

/** Most chords per full circle, to bound the vertex count of tiny tolerances. */
const MAX_CHORDS_PER_TURN = 1024;

/**
 * Number of chords needed so that no chord of an arc of radius `radius` and angle `sweepRad`
 * deviates from the arc by more than `tolerance` (same length unit as the radius). The
 * sagitta of a chord spanning θ is r(1 − cos(θ/2)), so θ ≤ 2·acos(1 − tolerance/r).
 * @throws {RangeError} when radius, sweep or tolerance is not a positive finite number.
 * @example arcSegmentCount(1, Math.PI / 2, 1 - Math.cos(Math.PI / 8)) // 2
 */
export function arcSegmentCount(radius: number, sweepRad: number, tolerance: number): number {
	for (const [name, value] of [
		['radius', radius],
		['sweep', sweepRad],
		['tolerance', tolerance]
	] as const) {
		if (!Number.isFinite(value) || value <= 0) {
			throw new RangeError(`arcSegmentCount: ${name} must be a positive number (got ${value})`);
		}
	}
	const ratio = Math.min(tolerance / radius, 1);
	const chordAngle = Math.min(2 * Math.acos(1 - ratio), MAX_CHORD_ANGLE_RAD);
	const minChordAngle = (2 * Math.PI) / MAX_CHORDS_PER_TURN;
	// The 1e-9 slack keeps an exact multiple (e.g. 90° in 45° steps) from rounding up.
	return Math.max(1, Math.ceil(sweepRad / Math.max(chordAngle, minChordAngle) - 1e-9));
}

function samePoint(a: GerberPoint, b: GerberPoint): boolean {
	return Math.abs(a[0] - b[0]) <= SAME_POINT && Math.abs(a[1] - b[1]) <= SAME_POINT;
}

function arcPoints(
	seg: Extract<GerberPathSegment, { type: 'arc' }>,
	tolerance: number
): GerberPoint[] {
	const end: GerberPoint = [seg.end[0], seg.end[1]];
	if (!(seg.radius > 0) || !(seg.sweep > 0)) return [end];
	const n = arcSegmentCount(seg.radius, seg.sweep, tolerance);
	const sign = seg.dir === 'cw' ? -1 : 1;
	const points: GerberPoint[] = [];
	for (let k = 1; k < n; k++) {
		const angle = seg.start[2] + (sign * seg.sweep * k) / n;
		points.push([
			seg.center[0] + seg.radius * Math.cos(angle),
			seg.center[1] + seg.radius * Math.sin(angle)
		]);
	}
	// The exact end point, not a computed one, so the next segment joins without a gap.
	points.push(end);
	return points;
}

/** A flattened contour: its vertices (first not repeated) and whether it closed on itself. */
export interface GerberContour {
	vertices: GerberPoint[];
	closed: boolean;
}

/**
 * Split a region's path into contours (a new contour starts wherever a segment does not begin
 * where the previous one ended, i.e. at a D02 move) and flatten arcs into chords.
 * Used by the Gerber importer for G36/G37 regions.
 * Reference: Gerber Layer Format Specification (Ucamco), section "Region statement".
 * @param tolerance largest chord-to-arc deviation, in the path's units.
 * @param maxVertices most vertices of one contour; counted (arcs by their chord count) before
 *   any vertex is made.
 * @throws {RangeError} when tolerance is not a positive number; {StencilBudgetError} when a
 *   contour would have more than `maxVertices` vertices.
 * @example
 * flattenGerberPath([{ type: 'line', start: [0, 0], end: [1, 0] }, { type: 'line', start: [1, 0], end: [0, 1] },
 * 	{ type: 'line', start: [0, 1], end: [0, 0] }], 0.001)
 * // [{ vertices: [[0, 0], [1, 0], [0, 1]], closed: true }]
 */
export function flattenGerberPath(
	path: readonly GerberPathSegment[],
	tolerance: number,
	maxVertices = Infinity
): GerberContour[] {
	if (!Number.isFinite(tolerance) || tolerance <= 0) {
		const got = `(got ${tolerance})`;
		throw new RangeError(`flattenGerberPath: tolerance must be a positive number ${got}`);
	}
	// Count first: a contour of many arcs would otherwise be built before it could be refused.
	let count = 0;
	let contour = 0;
	let last: GerberPoint | null = null;
	for (const seg of path) {
		const start: GerberPoint = [seg.start[0], seg.start[1]];
		if (last === null || !samePoint(last, start)) {
			contour++;
			count = 1;
		}
		count +=
			seg.type === 'line' || !(seg.radius > 0) || !(seg.sweep > 0)
				? 1
				: arcSegmentCount(seg.radius, seg.sweep, tolerance);
		if (count > maxVertices + 1)
			throw new StencilBudgetError(
				`contour ${contour} has more than ${formatCount(maxVertices)} vertices (arcs counted ` +
					`by their chords); the limit is ${formatCount(maxVertices)} per outline`,
				413
			);
		last = [seg.end[0], seg.end[1]];
	}
	const contours: GerberPoint[][] = [];
	let current: GerberPoint[] = [];
	for (const seg of path) {
		const start: GerberPoint = [seg.start[0], seg.start[1]];
		if (current.length === 0 || !samePoint(current[current.length - 1], start)) {
			if (current.length > 0) contours.push(current);
			current = [start];
		}
		if (seg.type === 'line') current.push([seg.end[0], seg.end[1]]);
		else current.push(...arcPoints(seg, tolerance));
	}
	if (current.length > 0) contours.push(current);
	return contours.map((points) => {
		const closed = points.length > 1 && samePoint(points[0], points[points.length - 1]);
		return { vertices: closed ? points.slice(0, -1) : points, closed };
	});
}
