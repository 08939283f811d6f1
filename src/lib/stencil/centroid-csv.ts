/**
 * Component centroid (pick-and-place) CSV: one row per component with its reference designator
 * and centre position. Columns `refdes`, `x`, `y` (header names also accepted: `designator`,
 * `ref`, `posx`/`pos_x`/`mid_x`/`center_x`, and the same for y); other columns are ignored.
 */
import { toMicrometres, type LengthUnit } from '../units';
import { NUMBER_RANGES } from './limits';
import { csvError, parseNumberCell, readCsvRows, type CsvError, MAX_CSV_ERRORS } from './csv-rows';

/** A component's reference designator and centre, µm. */
export interface ComponentCentroid {
	refdes: string;
	xUm: number;
	yUm: number;
}

/** Largest number of components accepted in one centroid file. */
export const MAX_CENTROIDS_PER_FILE = 20_000;

const ALIASES: Record<string, string> = {
	designator: 'refdes',
	ref: 'refdes',
	reference: 'refdes',
	posx: 'x',
	pos_x: 'x',
	mid_x: 'x',
	center_x: 'x',
	centre_x: 'x',
	posy: 'y',
	pos_y: 'y',
	mid_y: 'y',
	center_y: 'y',
	centre_y: 'y'
};

/**
 * Parse a centroid CSV (all-or-nothing, up to 100 errors). A unit suffix on a value (`12.5mm`)
 * is not accepted; the unit is chosen on import.
 * @returns `{ centroids }` or `{ errors: [{ row, column, message }] }` (row = file line).
 * @example parseCentroidCsv('refdes,x,y\nU1,10,5\n', 'mm') // { centroids: [{ refdes: 'U1', xUm: 10000, yUm: 5000 }] }
 */
export function parseCentroidCsv(
	text: string,
	unit: LengthUnit
): { centroids: ComponentCentroid[] } | { errors: CsvError[] } {
	const table = readCsvRows(text, MAX_CENTROIDS_PER_FILE, ALIASES);
	if ('errors' in table) return table;
	const missing = ['refdes', 'x', 'y'].filter((c) => !table.header.includes(c));
	if (missing.length > 0)
		return {
			errors: missing.map((c) =>
				csvError(1, c, `required column "${c}" is missing from the header`)
			)
		};
	const errors: CsvError[] = [];
	const centroids: ComponentCentroid[] = [];
	const firstLine = new Map<string, number>();
	for (const row of table.rows) {
		if (errors.length >= MAX_CSV_ERRORS) break;
		const refdes = row.cells['refdes'];
		if (!refdes) errors.push(csvError(row.line, 'refdes', 'must not be empty'));
		else if (firstLine.has(refdes))
			errors.push(
				csvError(row.line, 'refdes', `${refdes} already appears on line ${firstLine.get(refdes)}`)
			);
		else firstLine.set(refdes, row.line);
		const xy = (['x', 'y'] as const).map((c) => {
			const raw = row.cells[c] ?? '';
			const v = parseNumberCell(raw);
			if (v === null) {
				errors.push(csvError(row.line, c, `must be a number (got ${JSON.stringify(raw)})`));
				return null;
			}
			const um = toMicrometres(v, unit);
			if (!(Math.abs(um) <= NUMBER_RANGES.maxPositionUm)) {
				const message = `${raw} ${unit} is beyond ±${NUMBER_RANGES.maxPositionUm / 1000} mm`;
				errors.push(csvError(row.line, c, message));
				return null;
			}
			return v;
		});
		if (refdes && xy[0] !== null && xy[1] !== null)
			centroids.push({ refdes, xUm: toMicrometres(xy[0], unit), yUm: toMicrometres(xy[1], unit) });
	}
	if (errors.length > 0) return { errors: errors.slice(0, MAX_CSV_ERRORS) };
	return { centroids };
}
