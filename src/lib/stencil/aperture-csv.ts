/**
 * Rollbead's own aperture CSV layout (documented in reference/stencil/aperture-csv-layout.md):
 *
 * `refdes,pad,shape,length,width,corner_radius,diameter,x,y,rotation,vertices`
 *
 * Lengths in the unit chosen on import (um, mm, mil or inch); rotation in degrees
 * counter-clockwise; `vertices` as `x1 y1;x2 y2;...` relative to (x, y). Shapes: rectangle,
 * rounded-rectangle, obround (radius = half the smaller side), circle, polygon.
 */
import { toMicrometres, type LengthUnit } from '../units';
import type { ApertureInput, ApertureShape, PointUm } from './aperture';
import { checkAperture } from './aperture-validation';
import { DEFAULT_STENCIL_LIMITS, formatCount, type StencilLimits } from './limits';
import {
	MAX_CSV_ERRORS,
	csvError,
	parseNumberCell,
	readCsvRows,
	type CsvError,
	type CsvRow
} from './csv-rows';

/** Largest number of apertures accepted in one file. */
export const MAX_APERTURES_PER_FILE = 50_000;

/** Columns that must be in the header. */
export const APERTURE_CSV_REQUIRED_COLUMNS = ['refdes', 'pad', 'shape', 'x', 'y'] as const;

/** All known columns in the documented order (also the export order). */
export const APERTURE_CSV_COLUMNS = [
	'refdes',
	'pad',
	'shape',
	'length',
	'width',
	'corner_radius',
	'diameter',
	'x',
	'y',
	'rotation',
	'vertices'
] as const;

/** Shape spellings accepted in the `shape` column (case-insensitive). */
const SHAPE_NAMES: Record<string, ApertureShape | 'obround'> = {
	rectangle: 'rectangle',
	rect: 'rectangle',
	'rounded-rectangle': 'rounded-rectangle',
	rounded_rectangle: 'rounded-rectangle',
	roundrect: 'rounded-rectangle',
	obround: 'obround',
	oblong: 'obround',
	circle: 'circle',
	round: 'circle',
	polygon: 'polygon'
};

/** Which CSV column holds each ApertureInput field, to name columns in validation messages. */
const FIELD_TO_COLUMN: Record<string, string> = {
	lengthUm: 'length',
	widthUm: 'width',
	cornerRadiusUm: 'corner_radius',
	diameterUm: 'diameter',
	verticesUm: 'vertices',
	xUm: 'x',
	yUm: 'y',
	rotationDeg: 'rotation',
	shape: 'shape'
};

type Parsed<T> = { ok: true; value: T } | { ok: false };

function numberCell(
	row: CsvRow,
	column: string,
	errors: CsvError[],
	scale: number,
	required: boolean
): number | undefined | null {
	const raw = row.cells[column] ?? '';
	if (raw === '') {
		if (required) errors.push(csvError(row.line, column, 'is required for this shape but empty'));
		return required ? null : undefined;
	}
	const v = parseNumberCell(raw);
	if (v === null) {
		errors.push(csvError(row.line, column, `must be a number (got ${JSON.stringify(raw)})`));
		return null;
	}
	if (!Number.isFinite(v * scale)) {
		errors.push(csvError(row.line, column, `is out of range (got ${JSON.stringify(raw)})`));
		return null;
	}
	return v * scale;
}

function verticesCell(
	row: CsvRow,
	errors: CsvError[],
	scale: number,
	maxVertices: number
): Parsed<PointUm[]> {
	const raw = row.cells['vertices'] ?? '';
	if (raw === '') {
		errors.push(csvError(row.line, 'vertices', 'is required for a polygon but empty'));
		return { ok: false };
	}
	// Counted before the cell is split, so an endless vertex list costs one pass.
	let count = 1;
	for (let i = 0; i < raw.length; i++) if (raw.charCodeAt(i) === 59) count++;
	if (raw.trimEnd().endsWith(';')) count--;
	if (count > maxVertices) {
		const message =
			`the outline has ${formatCount(count)} vertices; ` +
			`the limit is ${formatCount(maxVertices)} per outline`;
		errors.push(csvError(row.line, 'vertices', message));
		return { ok: false };
	}
	const parts = raw
		.split(';')
		.map((p) => p.trim())
		.filter((p) => p !== '');
	const out: PointUm[] = [];
	for (let k = 0; k < parts.length; k++) {
		const xy = parts[k].split(/\s+/);
		const x = xy.length === 2 ? parseNumberCell(xy[0]) : null;
		const y = xy.length === 2 ? parseNumberCell(xy[1]) : null;
		if (x === null || y === null) {
			errors.push(
				csvError(
					row.line,
					'vertices',
					`vertex ${k + 1} must be two numbers "x y" (got ${JSON.stringify(parts[k])})`
				)
			);
			return { ok: false };
		}
		if (!Number.isFinite(x * scale) || !Number.isFinite(y * scale)) {
			const message = `vertex ${k + 1} is out of range (got ${JSON.stringify(parts[k])})`;
			errors.push(csvError(row.line, 'vertices', message));
			return { ok: false };
		}
		out.push([x * scale, y * scale]);
	}
	return { ok: true, value: out };
}

function rowToAperture(
	row: CsvRow,
	unit: LengthUnit,
	errors: CsvError[],
	maxVertices: number
): ApertureInput | null {
	const scale = toMicrometres(1, unit);
	const before = errors.length;
	const shapeRaw = (row.cells['shape'] ?? '').toLowerCase();
	const shapeName = SHAPE_NAMES[shapeRaw];
	if (!shapeName) {
		errors.push(
			csvError(
				row.line,
				'shape',
				`unknown shape ${JSON.stringify(row.cells['shape'] ?? '')}; ` +
					'expected rectangle, rounded-rectangle, obround, circle or polygon'
			)
		);
	}
	const x = numberCell(row, 'x', errors, scale, true);
	const y = numberCell(row, 'y', errors, scale, true);
	const rotation = numberCell(row, 'rotation', errors, 1, false);
	const aperture: ApertureInput = {
		refdes: row.cells['refdes'] ?? '',
		pad: row.cells['pad'] ?? '',
		shape: shapeName === 'obround' ? 'rounded-rectangle' : (shapeName ?? 'rectangle'),
		xUm: x ?? 0,
		yUm: y ?? 0,
		rotationDeg: rotation ?? 0
	};
	if (shapeName === 'circle') {
		const d = numberCell(row, 'diameter', errors, scale, true);
		if (d !== null && d !== undefined) aperture.diameterUm = d;
	} else if (shapeName === 'polygon') {
		const v = verticesCell(row, errors, scale, maxVertices);
		if (v.ok) aperture.verticesUm = v.value;
	} else if (shapeName) {
		const l = numberCell(row, 'length', errors, scale, true);
		const w = numberCell(row, 'width', errors, scale, true);
		if (l !== null && l !== undefined) aperture.lengthUm = l;
		if (w !== null && w !== undefined) aperture.widthUm = w;
		if (shapeName === 'obround') {
			if (l && w) aperture.cornerRadiusUm = Math.min(l, w) / 2;
		} else {
			const r = numberCell(row, 'corner_radius', errors, scale, shapeName === 'rounded-rectangle');
			if (r !== null && r !== undefined) aperture.cornerRadiusUm = r;
		}
	}
	if (errors.length > before) return null;
	for (const p of checkAperture(aperture, undefined, maxVertices)) {
		const field = p.field.replace(/\[.*$/, '');
		errors.push(csvError(row.line, FIELD_TO_COLUMN[field] ?? field, p.message));
	}
	return errors.length > before ? null : aperture;
}

/**
 * Parse an aperture CSV (all-or-nothing). Used by the stencil upload form and API.
 * @param unit the length unit of every length column in the file.
 * @returns `{ apertures }` or `{ errors }` with up to 100 `{ row, column, message }` entries,
 *   `row` being the file line (header = line 1).
 * @example parseApertureCsv('refdes,pad,shape,length,width,x,y\nU1,1,rectangle,1,0.2,10,5\n', 'mm')
 * // { apertures: [{ refdes: 'U1', pad: '1', shape: 'rectangle', lengthUm: 1000, widthUm: 200, xUm: 10000, yUm: 5000, rotationDeg: 0 }] }
 */
export function parseApertureCsv(
	text: string,
	unit: LengthUnit,
	limits: StencilLimits = DEFAULT_STENCIL_LIMITS
): { apertures: ApertureInput[] } | { errors: CsvError[]; overBudget?: boolean } {
	const table = readCsvRows(text, Math.min(MAX_APERTURES_PER_FILE, limits.maxAperturesPerStencil));
	if ('errors' in table) {
		// Control bytes or invalid UTF-8: a binary file (a spreadsheet, an image), said as such.
		const binary = /holds (a control character|bytes that are not valid UTF-8)/;
		return {
			...table,
			errors: table.errors.map((e) =>
				binary.test(e.message) ? { ...e, message: `this is not a CSV file: ${e.message}` } : e
			)
		};
	}
	const missing = APERTURE_CSV_REQUIRED_COLUMNS.filter((c) => !table.header.includes(c));
	if (missing.length > 0)
		return {
			errors: missing.map((c) =>
				csvError(
					1,
					c,
					`required column "${c}" is missing from the header ` +
						`(found: ${table.header.filter(Boolean).join(', ')})`
				)
			)
		};
	const errors: CsvError[] = [];
	const apertures: ApertureInput[] = [];
	let vertices = 0;
	for (const row of table.rows) {
		const a = rowToAperture(row, unit, errors, limits.maxOutlineVertices);
		if (a) apertures.push(a);
		vertices += a?.verticesUm?.length ?? 0;
		if (vertices > limits.maxVerticesPerImport) {
			const message =
				`the polygons reach more than ${formatCount(limits.maxVerticesPerImport)} vertices ` +
				`by this row; the limit is ${formatCount(limits.maxVerticesPerImport)} per import`;
			return { errors: [...errors, csvError(row.line, 'vertices', message)], overBudget: true };
		}
		if (errors.length >= MAX_CSV_ERRORS) break;
	}
	if (errors.length > 0) return { errors: errors.slice(0, MAX_CSV_ERRORS) };
	if (apertures.length === 0)
		return { errors: [csvError(1, null, 'the file has a header but no aperture rows')] };
	return { apertures };
}
