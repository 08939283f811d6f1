/**
 * Evaluated apertures as columns (one array per field) for the stencil page: JSON of plain
 * arrays is a fraction of the size of one object per aperture (no repeated keys), parses faster,
 * and lets the table sort an index array by one column instead of building 20,000 objects.
 * `columnAperture` / `columnRow` rebuild one aperture where one is needed (hover, a table page).
 */
import { APERTURE_SHAPES, type ApertureInput, type ApertureShape, type PointUm } from './aperture';
import type { MapLayers } from './map-layers';

/** The figures of one evaluated aperture that the page shows (µm, unrounded). */
export interface EvaluatedApertureLike extends ApertureInput {
	id: number;
	thicknessUm: number;
	minDimensionUm: number;
	areaRatio: number;
	aspectRatio: number;
	maxPassingThicknessUm: number;
	status: 'pass' | 'fail';
	reasons: { limit: 'areaRatio' | 'aspectRatio'; shortBy: number }[];
}

/** Column arrays, all of length `count`; null where a field does not apply to the shape. */
export interface ApertureColumns {
	count: number;
	id: number[];
	refdes: string[];
	pad: string[];
	/** Index into `APERTURE_SHAPES`. */
	shape: number[];
	xUm: number[];
	yUm: number[];
	rotationDeg: number[];
	lengthUm: (number | null)[];
	widthUm: (number | null)[];
	cornerRadiusUm: (number | null)[];
	diameterUm: (number | null)[];
	verticesUm: (PointUm[] | null)[];
	thicknessUm: number[];
	minDimensionUm: number[];
	areaRatio: number[];
	aspectRatio: number[];
	maxPassingThicknessUm: number[];
	/** 1 = fail, 0 = pass. */
	fail: number[];
	/** required − actual of a failed limit, null when that limit passes. */
	areaRatioShortBy: (number | null)[];
	aspectRatioShortBy: (number | null)[];
}

/** What `GET /api/stencils/{id}/apertures?layout=columns` answers (the page's map and table). */
export interface StencilColumnsAnswer {
	count: number;
	columns: ApertureColumns;
	/** The map's two status paths (SVG path data, µm, y up), their counts and extent. */
	map: Omit<MapLayers, 'skipped'>;
}

/** One row of the table, rebuilt from the columns. */
export interface ApertureRow extends ApertureInput {
	index: number;
	id: number;
	thicknessUm: number;
	minDimensionUm: number;
	areaRatio: number;
	aspectRatio: number;
	maxPassingThicknessUm: number;
	status: 'pass' | 'fail';
	reasons: { limit: 'areaRatio' | 'aspectRatio'; shortBy: number }[];
}

/**
 * Columns of a list of evaluated apertures, in list order. O(n).
 * @example aperturesToColumns([evaluated]).areaRatio // [0.74]
 */
export function aperturesToColumns(list: readonly EvaluatedApertureLike[]): ApertureColumns {
	const n = list.length;
	const c: ApertureColumns = {
		count: n,
		id: new Array(n),
		refdes: new Array(n),
		pad: new Array(n),
		shape: new Array(n),
		xUm: new Array(n),
		yUm: new Array(n),
		rotationDeg: new Array(n),
		lengthUm: new Array(n),
		widthUm: new Array(n),
		cornerRadiusUm: new Array(n),
		diameterUm: new Array(n),
		verticesUm: new Array(n),
		thicknessUm: new Array(n),
		minDimensionUm: new Array(n),
		areaRatio: new Array(n),
		aspectRatio: new Array(n),
		maxPassingThicknessUm: new Array(n),
		fail: new Array(n),
		areaRatioShortBy: new Array(n),
		aspectRatioShortBy: new Array(n)
	};
	list.forEach((a, i) => {
		c.id[i] = a.id;
		c.refdes[i] = a.refdes;
		c.pad[i] = a.pad;
		c.shape[i] = Math.max(0, APERTURE_SHAPES.indexOf(a.shape));
		c.xUm[i] = a.xUm;
		c.yUm[i] = a.yUm;
		c.rotationDeg[i] = a.rotationDeg;
		c.lengthUm[i] = a.lengthUm ?? null;
		c.widthUm[i] = a.widthUm ?? null;
		c.cornerRadiusUm[i] = a.cornerRadiusUm ?? null;
		c.diameterUm[i] = a.diameterUm ?? null;
		c.verticesUm[i] = a.verticesUm ?? null;
		c.thicknessUm[i] = a.thicknessUm;
		c.minDimensionUm[i] = a.minDimensionUm;
		c.areaRatio[i] = a.areaRatio;
		c.aspectRatio[i] = a.aspectRatio;
		c.maxPassingThicknessUm[i] = a.maxPassingThicknessUm;
		c.fail[i] = a.status === 'fail' ? 1 : 0;
		c.areaRatioShortBy[i] = a.reasons.find((r) => r.limit === 'areaRatio')?.shortBy ?? null;
		c.aspectRatioShortBy[i] = a.reasons.find((r) => r.limit === 'aspectRatio')?.shortBy ?? null;
	});
	return c;
}

/**
 * The aperture at list index `i` as the geometry functions take it (fields that do not apply are
 * left out, as stored).
 * @example columnAperture(aperturesToColumns([pad]), 0).shape // 'rectangle'
 */
export function columnAperture(c: ApertureColumns, i: number): ApertureInput {
	const a: ApertureInput = {
		refdes: c.refdes[i],
		pad: c.pad[i],
		shape: (APERTURE_SHAPES[c.shape[i]] ?? 'rectangle') as ApertureShape,
		xUm: c.xUm[i],
		yUm: c.yUm[i],
		rotationDeg: c.rotationDeg[i]
	};
	if (c.lengthUm[i] !== null) a.lengthUm = c.lengthUm[i]!;
	if (c.widthUm[i] !== null) a.widthUm = c.widthUm[i]!;
	if (c.cornerRadiusUm[i] !== null) a.cornerRadiusUm = c.cornerRadiusUm[i]!;
	if (c.diameterUm[i] !== null) a.diameterUm = c.diameterUm[i]!;
	if (c.verticesUm[i] !== null) a.verticesUm = c.verticesUm[i]!;
	return a;
}

/**
 * The aperture at list index `i` with its figures, for one table row or a tooltip.
 * @example columnRow(columns, 3).status // 'fail'
 */
export function columnRow(c: ApertureColumns, i: number): ApertureRow {
	const reasons: ApertureRow['reasons'] = [];
	if (c.areaRatioShortBy[i] !== null)
		reasons.push({ limit: 'areaRatio', shortBy: c.areaRatioShortBy[i]! });
	if (c.aspectRatioShortBy[i] !== null)
		reasons.push({ limit: 'aspectRatio', shortBy: c.aspectRatioShortBy[i]! });
	return {
		...columnAperture(c, i),
		index: i,
		id: c.id[i],
		thicknessUm: c.thicknessUm[i],
		minDimensionUm: c.minDimensionUm[i],
		areaRatio: c.areaRatio[i],
		aspectRatio: c.aspectRatio[i],
		maxPassingThicknessUm: c.maxPassingThicknessUm[i],
		status: c.fail[i] ? 'fail' : 'pass',
		reasons
	};
}
