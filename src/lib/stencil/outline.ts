/**
 * Placed outlines of apertures on the stencil (position and rotation applied), for the SVG
 * stencil map, bounding boxes and step-region lookup. Coordinates in µm, y up (CAD
 * convention): draw inside `<g transform="scale(1,-1)">` to show them the right way up in SVG.
 */
import { effectiveShape, type ApertureInput, type PointUm } from './aperture';
import { apertureGeometry } from './geometry';
import { openPolygon, polygonCentroid, polygonSignedArea } from './polygon';

/** Axis-aligned rectangle in µm. */
export interface BoundsUm {
	xMinUm: number;
	yMinUm: number;
	xMaxUm: number;
	yMaxUm: number;
}

function placer(aperture: ApertureInput): (p: PointUm) => PointUm {
	const t = (aperture.rotationDeg * Math.PI) / 180;
	const c = Math.cos(t);
	const s = Math.sin(t);
	return ([px, py]) => [aperture.xUm + px * c - py * s, aperture.yUm + px * s + py * c];
}

/** Unplaced rounded-rectangle outline, counter-clockwise, arcs as chords. */
function roundedRectanglePoints(l: number, w: number, r: number, perQuarter: number): PointUm[] {
	const hx = l / 2 - r;
	const hy = w / 2 - r;
	if (r === 0)
		return [
			[hx, -hy],
			[hx, hy],
			[-hx, hy],
			[-hx, -hy]
		];
	const centres: PointUm[] = [
		[hx, -hy],
		[hx, hy],
		[-hx, hy],
		[-hx, -hy]
	];
	const pts: PointUm[] = [];
	centres.forEach(([cx, cy], q) => {
		const start = -Math.PI / 2 + (q * Math.PI) / 2;
		for (let k = 0; k <= perQuarter; k++) {
			const a = start + (k * Math.PI) / 2 / perQuarter;
			pts.push([cx + r * Math.cos(a), cy + r * Math.sin(a)]);
		}
	});
	// Drop points repeated where an arc meets a zero-length straight (obround, circle).
	return pts.filter((p, i) => {
		const q = pts[(i + 1) % pts.length];
		return Math.hypot(p[0] - q[0], p[1] - q[1]) > 1e-9;
	});
}

/**
 * The aperture outline as a closed list of placed points (µm), arcs approximated by chords.
 * Used for drawing and hit-testing; the exact area and perimeter come from `apertureGeometry`.
 * @param segmentsPerQuarter chords per quarter circle (circles use 4× this many); default 8.
 * @throws {StencilInputError} when the aperture is invalid.
 * @example apertureOutlineUm({ ...pad, shape: 'rectangle', lengthUm: 2, widthUm: 1, xUm: 0, yUm: 0, rotationDeg: 0 })
 * // [[1,-0.5],[1,0.5],[-1,0.5],[-1,-0.5]]
 */
export function apertureOutlineUm(aperture: ApertureInput, segmentsPerQuarter = 8): PointUm[] {
	apertureGeometry(aperture); // validates
	return validApertureOutlineUm(aperture, segmentsPerQuarter);
}

/**
 * `apertureOutlineUm` without validation, for apertures already checked (stored ones).
 * @example validApertureOutlineUm(circle(500), 4).length // 16
 */
export function validApertureOutlineUm(aperture: ApertureInput, segmentsPerQuarter = 8): PointUm[] {
	const place = placer(aperture);
	const n = Math.max(1, Math.floor(segmentsPerQuarter));
	switch (effectiveShape(aperture)) {
		case 'circle': {
			const r = aperture.diameterUm! / 2;
			return Array.from({ length: 4 * n }, (_, k) => {
				const a = (k * Math.PI) / 2 / n;
				return place([r * Math.cos(a), r * Math.sin(a)]);
			});
		}
		case 'polygon':
			return openPolygon(aperture.verticesUm!).map(place);
		default:
			return roundedRectanglePoints(
				aperture.lengthUm!,
				aperture.widthUm!,
				aperture.cornerRadiusUm ?? 0,
				n
			).map(place);
	}
}

/**
 * Exact axis-aligned bounding box of the placed aperture (arcs included exactly).
 * For a rotated rounded rectangle the half-extent along x is (L/2−r)|cos θ| + (W/2−r)|sin θ| + r.
 * @throws {StencilInputError} when the aperture is invalid.
 * @example apertureBoundsUm({ ...pad, shape: 'circle', diameterUm: 500, xUm: 1000, yUm: 0, rotationDeg: 0 })
 * // { xMinUm: 750, yMinUm: -250, xMaxUm: 1250, yMaxUm: 250 }
 */
export function apertureBoundsUm(aperture: ApertureInput): BoundsUm {
	apertureGeometry(aperture);
	return validApertureBoundsUm(aperture);
}

/**
 * `apertureBoundsUm` without validation, for loops over apertures already checked with
 * `checkAperture` (the map builds 20,000 of them).
 * @example validApertureBoundsUm(circle(500, { xUm: 1000 })).xMaxUm // 1250
 */
export function validApertureBoundsUm(aperture: ApertureInput): BoundsUm {
	const shape = effectiveShape(aperture);
	if (shape === 'polygon') {
		const pts = openPolygon(aperture.verticesUm!).map(placer(aperture));
		const xs = pts.map((p) => p[0]);
		const ys = pts.map((p) => p[1]);
		return {
			xMinUm: Math.min(...xs),
			yMinUm: Math.min(...ys),
			xMaxUm: Math.max(...xs),
			yMaxUm: Math.max(...ys)
		};
	}
	let ex: number;
	let ey: number;
	if (shape === 'circle') {
		ex = ey = aperture.diameterUm! / 2;
	} else {
		const r = aperture.cornerRadiusUm ?? 0;
		const hx = aperture.lengthUm! / 2 - r;
		const hy = aperture.widthUm! / 2 - r;
		const t = (aperture.rotationDeg * Math.PI) / 180;
		const c = Math.abs(Math.cos(t));
		const s = Math.abs(Math.sin(t));
		ex = hx * c + hy * s + r;
		ey = hx * s + hy * c + r;
	}
	return {
		xMinUm: aperture.xUm - ex,
		yMinUm: aperture.yUm - ey,
		xMaxUm: aperture.xUm + ex,
		yMaxUm: aperture.yUm + ey
	};
}

/**
 * The aperture's centre on the stencil: (xUm, yUm) for rectangles and circles, the placed area
 * centroid for polygons (whose reference point may lie anywhere). Used for step regions,
 * centroid assignment and revision matching.
 * @throws {StencilInputError} when the aperture is invalid.
 * @example apertureCentreUm({ ...pad, shape: 'polygon', verticesUm: [[0,0],[2,0],[2,2],[0,2]], xUm: 10, yUm: 0, rotationDeg: 0 }) // [11, 1]
 */
export function apertureCentreUm(aperture: ApertureInput): PointUm {
	if (effectiveShape(aperture) === 'polygon') apertureGeometry(aperture);
	return validApertureCentreUm(aperture);
}

/**
 * `apertureCentreUm` without validation, for loops over already validated apertures.
 * @example validApertureCentreUm(rect(10, 10, { xUm: 3, yUm: 4 })) // [3, 4]
 */
export function validApertureCentreUm(aperture: ApertureInput): PointUm {
	if (effectiveShape(aperture) !== 'polygon') return [aperture.xUm, aperture.yUm];
	return placer(aperture)(polygonCentroid(openPolygon(aperture.verticesUm!)));
}

const fmt = (v: number): string => String(Math.round(v * 1000) / 1000);

/**
 * SVG path data (`d`) of the placed aperture in µm, exact arcs for circles and rounded
 * corners, always counter-clockwise (polygons listed clockwise are reversed). Coordinates are
 * y-up; see the module note on flipping.
 * @throws {StencilInputError} when the aperture is invalid.
 * @example apertureSvgPath({ ...pad, shape: 'rectangle', lengthUm: 2, widthUm: 1, xUm: 0, yUm: 0, rotationDeg: 0 })
 * // 'M1 -0.5L1 0.5L-1 0.5L-1 -0.5Z'
 */
export function apertureSvgPath(aperture: ApertureInput): string {
	apertureGeometry(aperture);
	return validApertureSvgPath(aperture);
}

/**
 * `apertureSvgPath` without validation, for loops over apertures already checked with
 * `checkAperture`.
 * @example validApertureSvgPath(rect(2, 1)) // 'M1 -0.5L1 0.5L-1 0.5L-1 -0.5Z'
 */
export function validApertureSvgPath(aperture: ApertureInput): string {
	const shape = effectiveShape(aperture);
	const place = placer(aperture);
	const pt = (p: PointUm) => `${fmt(p[0])} ${fmt(p[1])}`;
	if (shape === 'circle') {
		const r = aperture.diameterUm! / 2;
		const a = place([r, 0]);
		const b = place([-r, 0]);
		return `M${pt(a)}A${fmt(r)} ${fmt(r)} 0 1 1 ${pt(b)}A${fmt(r)} ${fmt(r)} 0 1 1 ${pt(a)}Z`;
	}
	if (shape === 'polygon') {
		const pts = openPolygon(aperture.verticesUm!).map(place);
		// Counter-clockwise like every other outline, so overlaps in a shared path stay filled.
		if (polygonSignedArea(pts) < 0) pts.reverse();
		return `M${pts.map(pt).join('L')}Z`;
	}
	const r = aperture.cornerRadiusUm ?? 0;
	const hx = aperture.lengthUm! / 2;
	const hy = aperture.widthUm! / 2;
	if (r === 0) {
		const pts: PointUm[] = [
			[hx, -hy],
			[hx, hy],
			[-hx, hy],
			[-hx, -hy]
		];
		return `M${pts.map(place).map(pt).join('L')}Z`;
	}
	// Counter-clockwise: straight side, then a quarter arc (sweep 1 = increasing angle).
	const arc = (p: PointUm) => `A${fmt(r)} ${fmt(r)} 0 0 1 ${pt(place(p))}`;
	return (
		`M${pt(place([hx, -hy + r]))}` +
		`L${pt(place([hx, hy - r]))}${arc([hx - r, hy])}` +
		`L${pt(place([-hx + r, hy]))}${arc([-hx, hy - r])}` +
		`L${pt(place([-hx, -hy + r]))}${arc([-hx + r, -hy])}` +
		`L${pt(place([hx - r, -hy]))}${arc([hx, -hy + r])}Z`
	);
}
