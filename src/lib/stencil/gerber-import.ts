/**
 * Import the apertures of a Gerber RS-274X solder-paste layer. Parsing is done by
 * `gerber-parser` and the geometry (macro evaluation, region paths, arcs, step-repeat) by
 * `gerber-plotter` (tracespace v4): see `readGerberImage`. This module turns the flashes and
 * regions into `ApertureInput` values in µm. All or nothing: any error fails the import.
 */
import gerberParser from 'gerber-parser';
import type { ApertureInput, PointUm } from './aperture';
import { MICROMETRES_PER } from '../units';
import { polygonAreaUm2, polygonCentroid, polygonSignedArea } from './polygon';
import { clippedArea, openRing, subtract, type ClippedPolygon } from './polygon-union';
import { gerberProblem, type GerberProblem } from './gerber-message';
import { checkGerberText } from './gerber-text-check';
import { readGerberImage, type GerberImage } from './gerber-image';
import { boxesOverlap, gerberOutlineBox, gerberOutlineToAperture } from './gerber-outline-aperture';
import { flattenGerberPath } from './gerber-path';
import {
	CUT_IN_SLIT_UM,
	MAX_CONTOUR_CROSSINGS,
	MAX_LAYER_CROSSINGS,
	repairRegionContour
} from './gerber-contour-repair';
import { macroShapeOutline } from './gerber-macro-outline';
import { nameGerberApertures } from './gerber-naming';
import { classifyGerberParserWarning } from './gerber-parser-warning';
import { rewriteMacroUnaryMinus } from './gerber-unary-minus';
import { scanGerberText } from './gerber-scan';
import { importDraws, type DrawnResult } from './gerber-draws';
import { findApertureOverlaps, liesWithin } from './overlaps';
import { validApertureGeometry } from './geometry';
import { validApertureOutlineUm } from './outline';
import {
	DEFAULT_STENCIL_LIMITS,
	formatCount,
	RELATIVE_TOLERANCE,
	StencilBudgetError,
	type StencilLimits
} from './limits';
import type {
	GerberCommand,
	GerberPadPrimitive,
	GerberOutline,
	GerberOutlineResult,
	GerberUnits
} from './gerber-types';

/** Largest accepted file, 20 MiB of text (Gerber is ASCII, so characters = bytes). */
export const GERBER_MAX_BYTES = 20 * 1024 * 1024;

/**
 * Default largest chord-to-arc deviation when arcs and circles become polygon edges, 0.5 µm:
 * a tenth or less of the ±5 µm or so to which laser-cut apertures are usually made
 * (common practice, from memory), so the flattening never matters to an area ratio.
 */
export const GERBER_ARC_TOLERANCE_UM = 0.5;

/** At most this many errors are listed; the rest are counted in a last message. */
const MAX_ERRORS = 50;

/** Options of `importGerberPasteLayer`. */
export interface GerberImportOptions {
	/** Size limit in bytes (characters); default `GERBER_MAX_BYTES`. */
	maxBytes?: number;
	/** Chord-to-arc tolerance in µm for regions and round macro parts; default 0.5. */
	arcToleranceUm?: number;
	/** Work budgets; default `DEFAULT_STENCIL_LIMITS`. */
	limits?: StencilLimits;
}

/** One import error; `line` is 1-based, 0 when the problem concerns the whole file. */
export type GerberImportError = GerberProblem;

/** A successful import. */
export interface GerberImportSuccess {
	/** Apertures in µm, named `@0001`… by position (see `nameGerberApertures`). */
	apertures: ApertureInput[];
	/** Things skipped or assumed, each `line N, <what>: <message>` or `file, …`. */
	warnings: string[];
	/** Units declared by the file (`%MOMM*%` / `%MOIN*%`); all output is in µm regardless. */
	units: GerberUnits;
	/** How the apertures came about. */
	counts: { flashes: number; regionContours: number; flashesSkipped: number; drawsSkipped: number };
	/** Openings painted with draws: islands made, draws used, line-like islands left out. */
	drawn: { openings: number; drawsUsed: number; lineLikeIslands: number };
	/**
	 * Flashes merged into the region they lie in (one pad), and pairs of openings that still
	 * overlap with the area they share (µm²); both are also in `warnings` with their lines.
	 */
	overlaps: { merged: number; pairs: number; sharedAreaUm2: number };
}

/** A failed import: every error found, sorted by line. */
export interface GerberImportFailure {
	errors: GerberImportError[];
	/** True when a work budget was exceeded (the file asks for too much work, 413). */
	overBudget?: boolean;
}

/** The result of `importGerberPasteLayer`. */
export type GerberImportResult = GerberImportSuccess | GerberImportFailure;

interface SyncParser {
	line: number;
	format: { filetype: string | null };
	parseSync(text: string): GerberCommand[];
	on(event: 'warning', listener: (w: { message: string; line: number }) => void): unknown;
}

/** An aperture with what is needed to relate it to clear-polarity objects. */
interface Placed {
	aperture: ApertureInput;
	box: number[];
	seq: number;
	line: number;
	/** What is left after clear-polarity cuts (placed µm outlines); unset when never cut. */
	pieces?: PointUm[][];
	/** A clear object would have left a hole in it (ignored, so its area is overstated). */
	holed?: boolean;
}

function failure(errors: readonly GerberProblem[]): GerberImportFailure {
	const sorted = [...errors].sort((a, b) => a.line - b.line);
	const overBudget = sorted.some((e) => e.budget);
	const flag = overBudget ? { overBudget } : {};
	if (sorted.length <= MAX_ERRORS) return { errors: sorted, ...flag };
	const rest = gerberProblem(0, 'errors', `${sorted.length - MAX_ERRORS} more not listed`);
	return { errors: [...sorted.slice(0, MAX_ERRORS), rest], ...flag };
}

/** Counts polygon vertices against the per-import budget before they are made. */
class VertexBudget {
	private used = 0;
	exceeded = false;
	constructor(
		private readonly max: number,
		private readonly errors: GerberProblem[]
	) {}
	/** Take `n` vertices for an object at `line`; false (and one error) when over the budget. */
	take(n: number, line: number, what: string): boolean {
		if (this.exceeded) return false;
		this.used += n;
		if (this.used <= this.max) return true;
		this.exceeded = true;
		const message =
			`the layer's polygon outlines reach more than ${formatCount(this.max)} vertices ` +
			`(step-and-repeat copies included); the limit is ${formatCount(this.max)} per import`;
		this.errors.push({ ...gerberProblem(line, what, message), budget: true });
		return false;
	}
}

/** Commands from gerber-parser with its warnings triaged into errors and warnings. */
interface Parsed {
	commands: GerberCommand[];
	errors: GerberProblem[];
	warnings: GerberProblem[];
}

/** Parse with gerber-parser; parser warnings are triaged into errors and warnings. */
function parseGerber(text: string): Parsed | GerberImportFailure {
	// The parser numbers lines from 0; everything here reports 1-based lines.
	const parser = gerberParser({}) as unknown as SyncParser;
	const parserWarnings: { message: string; line: number }[] = [];
	parser.on('warning', (w) => parserWarnings.push(w));
	let commands: GerberCommand[];
	try {
		commands = parser.parseSync(rewriteMacroUnaryMinus(text.replace(/^\uFEFF/, '')));
	} catch (e) {
		const reason = e instanceof Error ? e.message : String(e);
		const message = /format undefined/.test(reason)
			? 'a coordinate comes before the format statement (%FS…*%)'
			: `could not be parsed (${reason})`;
		return { errors: [gerberProblem(parser.line + 1, 'parse', message)] };
	}
	if (parser.format.filetype !== 'gerber') {
		const message = 'this looks like an NC drill file, not a Gerber layer';
		return { errors: [gerberProblem(1, 'content', message)] };
	}
	const errors: GerberProblem[] = [];
	const warnings: GerberProblem[] = [];
	for (const w of parserWarnings) {
		const action = classifyGerberParserWarning(w.message);
		const line = w.line + 1;
		if (action.kind === 'error') errors.push(gerberProblem(line, 'command', action.message));
		if (action.kind === 'warning') warnings.push(gerberProblem(line, 'parser', action.message));
	}
	return { commands, errors, warnings };
}

/** Apertures of the flashes; skipped apertures are reported once per D-code. */
function placeFlashes(
	image: GerberImage,
	f: number,
	tolerance: number,
	warnings: GerberProblem[],
	errors: GerberProblem[],
	limits: StencilLimits,
	vertices: VertexBudget
) {
	const outlines = new Map<string, GerberOutlineResult>();
	// Macro outlines cost about 0.1 ms per primitive (hull and coverage test): the same shape is
	// computed once, and the primitives of distinct shapes are counted against a budget first.
	const byShape = new Map<string, GerberOutlineResult>();
	let macroPrimitives = 0;
	const macroOutline = (shape: GerberPadPrimitive[], tool: string) => {
		const key = JSON.stringify(shape);
		const known = byShape.get(key);
		if (known) return known;
		macroPrimitives += shape.length;
		if (macroPrimitives > limits.maxMacroPrimitivesPerLayer) {
			const definedAt = image.tools.get(tool)?.line ?? 0;
			const message =
				`the macro apertures of the layer reach more than ` +
				`${formatCount(limits.maxMacroPrimitivesPerLayer)} primitives of distinct shapes; ` +
				`the limit is ${formatCount(limits.maxMacroPrimitivesPerLayer)} per layer`;
			errors.push({ ...gerberProblem(definedAt, `D${tool}`, message), budget: true });
			return null;
		}
		const result = macroShapeOutline(shape, tolerance);
		byShape.set(key, result);
		return result;
	};
	const skipped = new Map<string, { count: number; firstLine: number }>();
	const dark: Placed[] = [];
	const clear: Placed[] = [];
	for (const fl of image.flashes) {
		let result = outlines.get(fl.tool);
		if (!result) {
			const standard = image.tools.get(fl.tool)?.standard;
			result = standard ?? macroOutline(image.shapes.get(fl.tool) ?? [], fl.tool) ?? undefined;
			if (!result) break;
			if ('outline' in result && result.outline.kind === 'polygon') {
				const n = result.outline.vertices.length;
				if (n > limits.maxOutlineVertices) {
					const definedAt = image.tools.get(fl.tool)?.line ?? fl.line;
					const message =
						`the outline of aperture D${fl.tool} has ${formatCount(n)} vertices; ` +
						`the limit is ${formatCount(limits.maxOutlineVertices)} per outline`;
					errors.push({ ...gerberProblem(definedAt, `D${fl.tool}`, message), budget: true });
					result = { skipReason: 'has too many vertices' };
				}
			}
			outlines.set(fl.tool, result);
		}
		if ('skipReason' in result) {
			const s = skipped.get(fl.tool) ?? { count: 0, firstLine: fl.line };
			skipped.set(fl.tool, { count: s.count + fl.offsets.length, firstLine: s.firstLine });
			continue;
		}
		if (result.outline.kind === 'polygon' && !fl.clear) {
			const n = result.outline.vertices.length * fl.offsets.length;
			if (!vertices.take(n, fl.line, 'D03')) break;
		}
		for (const [ox, oy] of fl.offsets) {
			const [x, y] = [fl.x + ox, fl.y + oy];
			const box = gerberOutlineBox(result.outline, x, y);
			const aperture = gerberOutlineToAperture(result.outline, x, y, f);
			(fl.clear ? clear : dark).push({ aperture, box, seq: fl.seq, line: fl.line });
		}
	}
	for (const [tool, s] of skipped) {
		const definedAt = image.tools.get(tool)?.line ?? 0;
		const reason = (outlines.get(tool) as { skipReason: string }).skipReason;
		const message =
			`aperture D${tool} (defined at line ${definedAt}) ${reason}; ` +
			`${s.count} flash(es) skipped`;
		warnings.push(gerberProblem(s.firstLine, `D${tool}`, message));
	}
	const flashesSkipped = [...skipped.values()].reduce((sum, s) => sum + s.count, 0);
	return { dark, clear, flashesSkipped };
}

/** Apertures of the region contours, each a polygon placed at its area centroid. */
function placeRegions(
	image: GerberImage,
	f: number,
	tolerance: number,
	errors: GerberProblem[],
	warnings: GerberProblem[],
	limits: StencilLimits,
	budget: VertexBudget
) {
	const dark: Placed[] = [];
	let crossingsLeft = MAX_LAYER_CROSSINGS;
	let crossingBudgetHit = false;
	const clear: Placed[] = [];
	for (const region of image.regions) {
		let contours;
		try {
			contours = flattenGerberPath(region.path, tolerance, limits.maxOutlineVertices);
		} catch (e) {
			if (!(e instanceof StencilBudgetError)) throw e;
			errors.push({ ...gerberProblem(region.line, 'G36', e.message), budget: true });
			break;
		}
		if (budget.exceeded) break;
		contours.forEach((contour, k) => {
			if (budget.exceeded || crossingBudgetHit) return;
			const what = `G36 contour ${k + 1}`;
			if (!contour.closed) {
				// Many exporters leave out the last edge back to the start; the polygon closes it.
				const message =
					'the contour is not closed (its last point differs from its first); ' +
					'closed with a straight edge back to its start';
				warnings.push(gerberProblem(region.line, what, message));
			}
			const vertices = contour.vertices as PointUm[];
			// Crossing or touching contours are repaired into simple polygons or refused (see
			// gerber-contour-repair.ts: Gerber specification 4.10.3, nonzero winding); a bow-tie's
			// net area can be zero, so this comes before the zero-area test.
			const cap = Math.min(MAX_CONTOUR_CROSSINGS, crossingsLeft);
			const repair = vertices.length < 3 ? null : repairRegionContour(vertices, f, cap);
			if (repair && repair.kind !== 'simple') {
				if (repair.crossings > cap && cap < MAX_CONTOUR_CROSSINGS) {
					const message =
						`the layer's region contours cross themselves more than ` +
						`${formatCount(MAX_LAYER_CROSSINGS)} times; the limit is ` +
						`${formatCount(MAX_LAYER_CROSSINGS)} repaired crossings per layer`;
					errors.push({ ...gerberProblem(region.line, what, message), budget: true });
					crossingBudgetHit = true;
					return;
				}
				crossingsLeft -= Math.min(repair.crossings, cap);
			}
			const empty = repair?.kind === 'repaired' && repair.pieces.length === 0;
			if (!repair || empty || (repair.kind === 'simple' && polygonSignedArea(vertices) === 0)) {
				warnings.push(gerberProblem(region.line, what, 'the contour has zero area; skipped'));
				return;
			}
			let polygons: PointUm[][] = [vertices];
			if (repair.kind !== 'simple') {
				const where = `(${formatMm(repair.at[0] * f)}, ${formatMm(repair.at[1] * f)}) mm`;
				if (repair.kind === 'refused') {
					const message =
						`the contour crosses itself at ${where}: ${repair.reason}; contour skipped. ` +
						'List its vertices in order around the pad, or draw each pad as its own contour';
					warnings.push(gerberProblem(region.line, what, message));
					return;
				}
				polygons = repair.pieces;
				const n = polygons.length;
				const holes =
					repair.holesJoined > 0
						? `; ${repair.holesJoined} hole(s) kept, each joined to the outside by a ` +
							`${CUT_IN_SLIT_UM * 1000} nm slit (an opening is one simple polygon)`
						: '';
				const dropped =
					repair.dropped > 0 ? `; ${repair.dropped} piece(s) under 1 µm² left out` : '';
				const message = repair.crossed
					? `contour crossed itself at ${where}; repaired into ${n} opening(s) by the ` +
						`nonzero winding rule (overlapping loops united)${holes}${dropped}`
					: `contour touches itself at ${where} (a cut-in or touching loops); made into ` +
						`${n} simple opening(s)${holes}${dropped}`;
				warnings.push(gerberProblem(region.line, what, message));
			}
			for (const polygon of polygons) {
				if (polygon.length > limits.maxOutlineVertices) {
					const message =
						`the repaired contour has ${formatCount(polygon.length)} vertices; the limit is ` +
						`${formatCount(limits.maxOutlineVertices)} per outline`;
					errors.push({ ...gerberProblem(region.line, what, message), budget: true });
					return;
				}
				const n = polygon.length * region.offsets.length;
				if (!region.clear && !budget.take(n, region.line, what)) return;
				const [cx, cy] = polygonCentroid(polygon);
				const outline: GerberOutline = {
					kind: 'polygon',
					vertices: polygon.map(([x, y]) => [x - cx, y - cy]),
					cx,
					cy,
					rotationDeg: 0
				};
				for (const [ox, oy] of region.offsets) {
					const box = gerberOutlineBox(outline, ox, oy);
					const aperture = gerberOutlineToAperture(outline, ox, oy, f);
					const placed = { aperture, box, seq: region.seq, line: region.line };
					(region.clear ? clear : dark).push(placed);
				}
			}
		});
	}
	return { dark, clear };
}

/** A length in µm as mm for messages, to the µm (`1.5`, `-0.012`). */
function formatMm(um: number): string {
	return String(Number((um / 1000).toFixed(3)));
}

/** Most box tests spent relating clear objects to dark ones; past it the check stops (warned). */
const MAX_OVERLAP_TESTS = 20_000_000;

/**
 * Dark objects drawn before a clear object and overlapping it, in list order, found through a
 * uniform grid of the dark boxes (a scan of every dark object per clear one was quadratic:
 * 100,000 of each made 10 billion box tests). Boxes wider or taller than four cells are kept in
 * a short list tested every time. `tests` counts the box tests made.
 */
function overlapFinder(dark: readonly Placed[]) {
	const state = { tests: 0 };
	if (dark.length === 0) return { state, find: (): Placed[] => [] };
	let [x0, y0, x1, y1] = [Infinity, Infinity, -Infinity, -Infinity];
	for (const d of dark) {
		x0 = Math.min(x0, d.box[0]);
		y0 = Math.min(y0, d.box[1]);
		x1 = Math.max(x1, d.box[2]);
		y1 = Math.max(y1, d.box[3]);
	}
	const side = Math.max(1, Math.ceil(Math.sqrt(dark.length)));
	const cw = (x1 - x0) / side || 1;
	const ch = (y1 - y0) / side || 1;
	const col = (x: number) => Math.min(side - 1, Math.max(0, Math.floor((x - x0) / cw)));
	const row = (y: number) => Math.min(side - 1, Math.max(0, Math.floor((y - y0) / ch)));
	const cells = new Map<number, number[]>();
	const big: number[] = [];
	dark.forEach((d, i) => {
		if (d.box[2] - d.box[0] > 4 * cw || d.box[3] - d.box[1] > 4 * ch) return big.push(i);
		// Filed under the lower-left cell; a query looks up to five cells back.
		const key = row(d.box[1]) * side + col(d.box[0]);
		const list = cells.get(key);
		if (list) list.push(i);
		else cells.set(key, [i]);
	});
	const find = (c: Omit<Placed, 'aperture'>): Placed[] => {
		const found: number[] = [];
		const test = (i: number) => {
			state.tests++;
			const d = dark[i];
			if (d.seq < c.seq && boxesOverlap(d.box, c.box)) found.push(i);
		};
		big.forEach(test);
		const [c0, c1] = [Math.max(0, col(c.box[0]) - 5), col(c.box[2])];
		const [r0, r1] = [Math.max(0, row(c.box[1]) - 5), row(c.box[3])];
		for (let r = r0; r <= r1; r++)
			for (let q = c0; q <= c1; q++) cells.get(r * side + q)?.forEach(test);
		return found.sort((a, b) => a - b).map((i) => dark[i]);
	};
	return { state, find };
}

/**
 * Cut clear-polarity object `c` out of the earlier dark apertures `hit` (their boxes overlap):
 * each keeps what remains, as polygons; a cut that would leave a hole is ignored (warned).
 */
function cutByClear(c: Placed, hit: readonly Placed[], warnings: GerberProblem[]) {
	const cutter = validApertureOutlineUm(c.aperture, 16);
	const cut: Placed[] = [];
	const holed: Placed[] = [];
	for (const d of hit) {
		const current = d.pieces ?? [validApertureOutlineUm(d.aperture, 16)];
		if (current.length === 0) continue;
		let rest: ClippedPolygon[];
		try {
			rest = subtract(current, cutter);
		} catch {
			holed.push(d);
			continue;
		}
		const before = current.reduce((sum, p) => sum + polygonAreaUm2(p), 0);
		if (before - clippedArea(rest) <= RELATIVE_TOLERANCE * before) continue;
		if (rest.some((p) => p.length > 1)) {
			d.holed = true;
			holed.push(d);
			continue;
		}
		d.pieces = rest.map((p) => openRing(p[0]));
		cut.push(d);
	}
	if (cut.length > 0) {
		const message =
			`a clear-polarity object cuts ${cut.length} earlier aperture(s) (first from line ` +
			`${cut[0].line}); each keeps what remains, as polygons`;
		warnings.push(gerberProblem(c.line, '%LPC', message));
	}
	if (holed.length > 0) {
		const message =
			`a clear-polarity object would leave a hole in ${holed.length} earlier aperture(s) ` +
			`(first from line ${holed[0].line}), which an opening cannot have; the cut-out is ` +
			'ignored, so their areas are overstated';
		warnings.push(gerberProblem(c.line, '%LPC', message));
	}
}

/** A dark aperture as it is after clear-polarity cuts: itself, its remaining pieces, or none. */
function afterCuts(d: Placed): Placed[] {
	if (!d.pieces) return [d];
	return d.pieces
		.filter((p) => p.length >= 3 && polygonAreaUm2(p) > 0)
		.map((p) => {
			const [cx, cy] = polygonCentroid(p);
			const aperture: ApertureInput = {
				refdes: '',
				pad: '',
				shape: 'polygon',
				verticesUm: p.map(([x, y]) => [x - cx, y - cy] as PointUm),
				xUm: cx,
				yUm: cy,
				rotationDeg: 0
			};
			return { ...d, aperture, pieces: undefined };
		});
}

/**
 * Relate the openings of a layer: a flash lying wholly inside a region is the same pad (a
 * custom pad drawn as a region with a flash on it) and is merged into the region; other
 * overlapping openings stay, each pair named by its lines in one warning, since the stencil's
 * summed paste area counts what they share twice (it also shows their union).
 */
function relateOpenings(
	flashes: readonly Placed[],
	regions: readonly Placed[],
	drawn: DrawnResult,
	warnings: GerberProblem[]
) {
	const all = [
		...flashes.map((d) => ({ a: d.aperture, line: d.line, flash: true, holed: false })),
		...regions.map((d) => ({ a: d.aperture, line: d.line, flash: false, holed: !!d.holed })),
		...drawn.apertures.map((a, k) => ({
			a,
			line: drawn.apertureLines[k],
			flash: false,
			holed: false
		}))
	];
	const areas = all.map((o) => validApertureGeometry(o.a).areaUm2);
	const report = findApertureOverlaps(
		all.map((o) => o.a),
		areas
	);
	const merged = new Set<number>();
	const regionStart = flashes.length;
	const regionEnd = flashes.length + regions.length;
	const isRegion = (i: number) => i >= regionStart && i < regionEnd;
	for (const { a, b } of report.pairs) {
		const [f, r] =
			all[a].flash && isRegion(b) ? [a, b] : all[b].flash && isRegion(a) ? [b, a] : [-1, -1];
		if (f < 0 || merged.has(f) || all[r].holed) continue;
		if (!liesWithin(validApertureOutlineUm(all[f].a, 16), validApertureOutlineUm(all[r].a, 16)))
			continue;
		merged.add(f);
		const message =
			`the flash lies wholly inside the region of line ${all[r].line} (one pad); ` +
			'merged into it as one opening';
		warnings.push(gerberProblem(all[f].line, 'D03', message));
	}
	const rest = report.pairs.filter((p) => !merged.has(p.a) && !merged.has(p.b));
	const sharedAreaUm2 = rest.reduce((s, p) => s + p.areaUm2, 0);
	if (rest.length > 0) {
		const shown = rest
			.slice(0, 8)
			.map((p) => `lines ${all[p.a].line} and ${all[p.b].line}`)
			.join('; ');
		const more = rest.length > 8 ? `; and ${rest.length - 8} more` : '';
		const message =
			`${rest.length} pair(s) of openings overlap, sharing ${(sharedAreaUm2 / 1e6).toFixed(4)} mm² ` +
			`(${shown}${more}); the summed paste area counts it twice, the union once`;
		warnings.push(gerberProblem(all[rest[0].a].line, 'overlap', message));
	}
	if (!report.complete && report.note) warnings.push(gerberProblem(0, 'overlap', report.note));
	return {
		kept: all.filter((_, i) => !merged.has(i)).map((o) => o.a),
		overlaps: { merged: merged.size, pairs: rest.length, sharedAreaUm2 }
	};
}

/**
 * Import a Gerber RS-274X solder-paste layer (text) as stencil apertures in µm.
 * Used when a process engineer uploads the paste Gerber of a board; the lead's code can then
 * replace the positional names with real refdes from a centroid file.
 *
 * - Flashes (D03) of standard apertures map exactly: C → circle, R → rectangle,
 *   O → rounded rectangle (radius half the smaller side; a circle if both sides are equal),
 *   P → polygon (vertices of the unrotated polygon, `rotationDeg` = the P rotation).
 * - Flashes of macro apertures: see `macroShapeOutline` (one primitive → exact shape, rotated
 *   center/vector lines → rotated rectangle, the usual rounded-rectangle macro → exact rounded
 *   rectangle, other convex combinations → convex hull polygon, non-convex → skipped).
 * - Regions (G36/G37): each contour becomes a polygon placed at its area centroid; arcs are cut
 *   into chords within `arcToleranceUm` (see `flattenGerberPath`); a contour that does not end
 *   where it started is closed with a straight edge, with a warning naming its line. A contour
 *   that crosses or touches itself is filled by the nonzero winding rule into simple polygons
 *   (cut-in holes kept with a slit) or, when its loops turn both ways, left out with a warning
 *   (`repairRegionContour`; Gerber specification 4.10.3).
 * - Step-repeat (%SR) copies are expanded. Draws (D01 outside a region), clear-polarity
 *   objects, moiré/thermal macros and apertures with holes are skipped with a warning.
 * - Names: refdes `@0001`, `@0002`, … sorted by y then x, pad `1` (`nameGerberApertures`).
 *
 * Errors (each with its 1-based line): size limit, binary data, not Gerber, unknown or
 * geometry-changing commands (%MI, %OF, %LR …), units (%MO) or format (%FS) missing, an
 * undefined aperture or macro, flashes or aperture changes inside a region, a region without G37,
 * incremental coordinates, a missing M02 (truncated file), no flashes or regions at all.
 *
 * Synchronous and CPU-bound: about 20 000 commands per second on the project machine (measured
 * 25 000 flashes, 0.57 MB, in 1.8 s), so a file near the 20 MB limit can take about a minute.
 *
 * Reference: Gerber Layer Format Specification (Ucamco), revision 2022.02 or any since 2013.
 * @throws never; every problem is returned in `errors`.
 * @example
 * importGerberPasteLayer('%FSLAX26Y26*%\n%MOMM*%\n%ADD10R,1X0.5*%\nD10*\nX1000000Y0D03*\nM02*\n')
 * // { apertures: [{ refdes: '@0001', pad: '1', shape: 'rectangle', lengthUm: 1000, widthUm: 500,
 * //   xUm: 1000, yUm: 0, rotationDeg: 0 }], warnings: [], units: 'mm',
 * //   counts: { flashes: 1, regionContours: 0, flashesSkipped: 0, drawsSkipped: 0 } }
 */
export function importGerberPasteLayer(
	text: string,
	options: GerberImportOptions = {}
): GerberImportResult {
	const maxBytes = options.maxBytes ?? GERBER_MAX_BYTES;
	const limits = options.limits ?? DEFAULT_STENCIL_LIMITS;
	const toleranceUm = options.arcToleranceUm ?? GERBER_ARC_TOLERANCE_UM;
	if (!(toleranceUm > 0) || !Number.isFinite(toleranceUm)) {
		const message = `must be a positive number (got ${toleranceUm})`;
		return { errors: [gerberProblem(0, 'arcToleranceUm', message)] };
	}
	const textProblem = checkGerberText(text, maxBytes);
	if (textProblem) return { errors: [textProblem] };
	// Numbers read strictly and work counted before the parser builds anything.
	const scan = scanGerberText(text, limits, MAX_ERRORS);
	if (scan.errors.length > 0) return failure(scan.errors);

	const parsed = parseGerber(text);
	if (!('commands' in parsed)) return parsed;
	// The last line with content: where a truncated file stops.
	const lastLine = text.trimEnd().split('\n').length;
	const image = readGerberImage(parsed.commands, lastLine, MAX_ERRORS, limits);
	const errors = [...parsed.errors, ...image.errors];
	const warnings = [...parsed.warnings, ...image.warnings];
	if (errors.length > 0) return failure(errors);

	// Geometry stays in file units until `gerberOutlineToAperture` scales by f.
	const units = image.units as GerberUnits;
	const f = units === 'in' ? MICROMETRES_PER.inch : MICROMETRES_PER.mm;
	const tolerance = toleranceUm / f;
	const vertices = new VertexBudget(limits.maxVerticesPerImport, errors);
	const flashes = placeFlashes(image, f, tolerance, warnings, errors, limits, vertices);
	const regions = placeRegions(image, f, tolerance, errors, warnings, limits, vertices);
	if (errors.length > 0) return failure(errors);
	let drawn: DrawnResult;
	try {
		drawn = importDraws(image.strokes, f, toleranceUm, limits, (n, line) =>
			vertices.take(n, line, 'D01')
		);
	} catch (e) {
		if (!(e instanceof StencilBudgetError)) throw e;
		const line = Number(/^line (\d+)/.exec(e.message)?.[1] ?? image.firstDrawLine);
		const message = e.message.replace(/^line \d+: /, '');
		return failure([{ ...gerberProblem(line, 'D01', message), budget: true }]);
	}
	if (errors.length > 0) return failure(errors);
	for (const w of drawn.warnings) warnings.push(gerberProblem(w.line, w.what, w.message));

	// Clear polarity cuts what was drawn before it: the cut aperture becomes what remains (one or
	// more polygons), unless the cut would leave a hole, which an opening cannot have.
	const dark = [...flashes.dark, ...regions.dark];
	const clear = [...flashes.clear, ...regions.clear];
	const overlaps = overlapFinder(dark);
	for (const c of clear) {
		if (overlaps.state.tests > MAX_OVERLAP_TESTS) {
			const message = 'too many overlaps to relate every clear-polarity object; check stopped';
			warnings.push(gerberProblem(c.line, '%LPC', message));
			break;
		}
		const hit = overlaps.find(c);
		if (hit.length > 0) cutByClear(c, hit, warnings);
	}
	if (clear.length > 0) {
		const message = `${clear.length} clear-polarity object(s) applied as cuts, none an opening`;
		warnings.push(gerberProblem(0, '%LPC', message));
	}
	const lineLikeIslands = drawn.islands.filter((i) => i.lineLike).length;
	if (drawn.apertures.length > 0) {
		const message =
			`${drawn.apertures.length} opening(s) painted with ${drawn.drawsUsed} draw(s) ` +
			'were united into polygons (marked as drawn)';
		warnings.push(gerberProblem(image.firstDrawLine, 'D01', message));
	}
	if (dark.length === 0 && drawn.apertures.length === 0 && image.flashes.length === 0) {
		if (image.regions.length === 0) {
			const message =
				`no flashes (D03) or regions (G36/G37), and the ${image.draws} draw(s) with D01 make ` +
				`no pad-sized island (${lineLikeIslands} line-like; the warnings say why): nothing to import`;
			return failure([gerberProblem(0, 'content', message), ...warnings]);
		}
	}
	if (dark.length === 0 && drawn.apertures.length === 0) {
		// The reasons are in the warnings; without apertures they become the errors.
		const message = 'no usable apertures: every flash and region was skipped';
		const none = gerberProblem(0, 'content', message);
		return failure([none, ...warnings]);
	}
	const relation = relateOpenings(
		flashes.dark.flatMap(afterCuts),
		regions.dark.flatMap(afterCuts),
		drawn,
		warnings
	);
	return {
		apertures: nameGerberApertures(relation.kept),
		warnings: warnings.sort((a, b) => a.line - b.line).map((w) => w.message),
		units,
		counts: {
			flashes: flashes.dark.length,
			regionContours: regions.dark.length,
			flashesSkipped: flashes.flashesSkipped,
			drawsSkipped: drawn.drawsLeftOut
		},
		drawn: {
			openings: drawn.apertures.length,
			drawsUsed: drawn.drawsUsed,
			lineLikeIslands
		},
		overlaps: relation.overlaps
	};
}
