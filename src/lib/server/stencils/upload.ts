import { importGerberPasteLayer } from '$lib/stencil/gerber-import';
import {
	DEFAULT_STENCIL_LIMITS,
	StencilBudgetError,
	type StencilLimits
} from '$lib/stencil/limits';
import {
	assignRefdesFromCentroids,
	parseApertureCsv,
	parseCentroidCsv,
	type ApertureInput
} from '$lib/stencil';
import { parseLengthUnit, type LengthUnit } from '$lib/units';

/** Gerber import runs synchronously at about 20,000 commands/s, so its files are kept small. */
export const MAX_GERBER_BYTES = 5 * 1024 * 1024;
/** 50,000 CSV rows of ordinary width fit well inside this. */
export const MAX_CSV_BYTES = 20 * 1024 * 1024;
/** A centroid file of 20,000 components. */
export const MAX_CENTROID_BYTES = 5 * 1024 * 1024;
/** Default distance within which a Gerber aperture takes a centroid's refdes (µm). */
export const DEFAULT_CENTROID_RADIUS_UM = 10_000;
/** Largest centroid radius, 100 mm: wider only makes every aperture a candidate of every part. */
export const MAX_CENTROID_RADIUS_UM = 100_000;

/** One problem in an uploaded file: its line (0 = the whole file), column or command, message. */
export interface UploadProblem {
	file: string;
	line: number;
	column: string | null;
	message: string;
}

/** A parsed upload ready for `importApertures`, or why it was refused. */
export type UploadResult =
	| {
			ok: true;
			format: 'csv' | 'gerber';
			apertures: ApertureInput[];
			unit: string;
			warnings: string[];
	  }
	| { ok: false; status: 400 | 413 | 422; error: string; errors: UploadProblem[] };

/** The uploaded files and fields of `POST /api/stencils/{id}/apertures` (multipart). */
export interface UploadInput {
	fileName: string;
	text: string;
	byteLength: number;
	/** Forced format; otherwise detected from the content, then the extension. */
	format?: string | null;
	unit?: string | null;
	centroids?: { fileName: string; text: string; byteLength: number } | null;
	centroidUnit?: string | null;
	centroidRadiusUm?: number | null;
}

const GERBER_EXTENSIONS = /\.(gbr|ger|gtp|gbp|gpt|gpb|pho|art|gbx)$/i;

/**
 * Decide whether an upload is a Gerber layer or our CSV: a Gerber file has a format (`%FS`) or
 * unit (`%MO`) statement, or starts with a `G04` comment; a Gerber extension decides otherwise.
 * @example detectUploadFormat('x.txt', '%FSLAX26Y26*%\n%MOMM*%') // 'gerber'
 */
export function detectUploadFormat(fileName: string, text: string): 'csv' | 'gerber' {
	const head = text.slice(0, 4096).replace(/^\uFEFF/, '');
	if (/%FS[LTD]?[AI]X\d\dY\d\d\*%|%MO(MM|IN)\*%/.test(head) || /^\s*G04\b/.test(head))
		return 'gerber';
	if (/\.csv$/i.test(fileName)) return 'csv';
	return GERBER_EXTENSIONS.test(fileName) ? 'gerber' : 'csv';
}

function refuse(
	status: 400 | 413 | 422,
	error: string,
	errors: UploadProblem[] = []
): UploadResult {
	return { ok: false, status, error, errors };
}

function unitOf(raw: string | null | undefined, field: string, file: string) {
	const unit = raw ? parseLengthUnit(raw) : null;
	if (unit) return unit;
	const message = raw
		? `unknown unit ${JSON.stringify(raw)}; expected um, mm, mil or inch`
		: 'is required: um, mm, mil or inch';
	return refuse(400, `${field} ${message}.`, [{ file, line: 0, column: field, message }]);
}

const mb = (bytes: number) => `${Math.round(bytes / 1024 / 1024)} MB`;

/**
 * Parse an uploaded aperture file (our CSV layout or a Gerber paste layer), optionally naming
 * Gerber apertures from a centroid CSV. Nothing is stored here; all-or-nothing storing is
 * `importApertures`. Errors name the file, line and column (CSV) or command (Gerber); a file
 * that asks for more work than `limits` allow is refused with 413 before the work is done.
 * CPU-bound: the server runs it on a parser thread (`parseApertureUploadOffThread`).
 * @example parseApertureUpload({ fileName: 'top.csv', text, byteLength: text.length, unit: 'mm' })
 */
export function parseApertureUpload(
	input: UploadInput,
	limits: StencilLimits = DEFAULT_STENCIL_LIMITS
): UploadResult {
	const file = input.fileName || 'upload';
	const format =
		input.format === 'csv' || input.format === 'gerber'
			? input.format
			: detectUploadFormat(file, input.text);
	const limit = format === 'gerber' ? MAX_GERBER_BYTES : MAX_CSV_BYTES;
	if (input.byteLength > limit)
		return refuse(
			413,
			`${file} is ${mb(input.byteLength)}; a ${format === 'gerber' ? 'Gerber' : 'CSV'} ` +
				`aperture file may be at most ${mb(limit)}.`
		);
	let apertures: ApertureInput[];
	let unit: string;
	const warnings: string[] = [];
	if (format === 'csv') {
		const u = unitOf(input.unit, 'unit', file);
		if (typeof u !== 'string') return u;
		const parsed = parseApertureCsv(input.text, u, limits);
		if ('errors' in parsed)
			return refuse(
				parsed.overBudget ? 413 : 422,
				`${file} has ${parsed.errors.length} error(s); nothing was imported.`,
				parsed.errors.map((e) => ({ file, line: e.row, column: e.column, message: e.message }))
			);
		apertures = parsed.apertures;
		unit = u;
	} else {
		const parsed = importGerberPasteLayer(input.text, { maxBytes: MAX_GERBER_BYTES, limits });
		if ('errors' in parsed)
			return refuse(
				parsed.overBudget ? 413 : 422,
				`${file} has ${parsed.errors.length} error(s); nothing was imported.`,
				parsed.errors.map((e) => ({ file, line: e.line, column: null, message: e.message }))
			);
		apertures = parsed.apertures;
		unit = parsed.units === 'in' ? 'inch' : 'mm';
		warnings.push(...parsed.warnings);
	}
	if (input.centroids) {
		const c = input.centroids;
		if (c.byteLength > MAX_CENTROID_BYTES)
			return refuse(
				413,
				`${c.fileName} is ${mb(c.byteLength)}; a centroid file may be at most ` +
					`${mb(MAX_CENTROID_BYTES)}.`
			);
		const cu = unitOf(input.centroidUnit ?? input.unit, 'centroidUnit', c.fileName);
		if (typeof cu !== 'string') return cu;
		const radius = input.centroidRadiusUm ?? DEFAULT_CENTROID_RADIUS_UM;
		if (!Number.isFinite(radius) || radius <= 0 || radius > MAX_CENTROID_RADIUS_UM)
			return refuse(
				400,
				`centroidRadiusUm must be a number greater than 0 and at most ${MAX_CENTROID_RADIUS_UM}.`,
				[
					{
						file: c.fileName,
						line: 0,
						column: 'centroidRadiusUm',
						message: `must be > 0 and ≤ ${MAX_CENTROID_RADIUS_UM} µm (got ${radius})`
					}
				]
			);
		const parsed = parseCentroidCsv(c.text, cu as LengthUnit);
		if ('errors' in parsed)
			return refuse(
				422,
				`${c.fileName} has ${parsed.errors.length} error(s); nothing was imported.`,
				parsed.errors.map((e) => ({
					file: c.fileName,
					line: e.row,
					column: e.column,
					message: e.message
				}))
			);
		let assigned;
		try {
			assigned = assignRefdesFromCentroids(apertures, parsed.centroids, radius);
		} catch (e) {
			if (!(e instanceof StencilBudgetError)) throw e;
			return refuse(413, `${c.fileName}: ${e.message}; nothing was imported.`, [
				{ file: c.fileName, line: 0, column: null, message: `file, centroids: ${e.message}` }
			]);
		}
		apertures = assigned.apertures;
		if (assigned.unassigned.length > 0)
			warnings.push(
				`${assigned.unassigned.length} aperture(s) have no component centroid within ` +
					`${radius} µm and keep their position names`
			);
	}
	return { ok: true, format, apertures, unit, warnings };
}
