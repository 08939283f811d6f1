/**
 * Import the apertures of a Gerber RS-274X solder-paste layer. Parsing is done by
 * `gerber-parser` and the geometry (macro evaluation, region paths, arcs, step-repeat) by
 * `gerber-plotter` (tracespace v4); this module validates the command stream, drives the
 * plotter one command at a time so every image object keeps its source line, and turns pads
 * and regions into `ApertureInput` values in µm. All or nothing: any error fails the import.
 */
import gerberParser from 'gerber-parser';
import gerberPlotter from 'gerber-plotter';
import type { ApertureInput, PointUm } from './aperture';
import { MICROMETRES_PER } from '../units';
import { findSelfIntersection, polygonCentroid, polygonSignedArea } from './polygon';
import { flattenGerberPath } from './gerber-path';
import { macroShapeOutline } from './gerber-macro-outline';
import { nameGerberApertures } from './gerber-naming';
import { classifyGerberParserWarning } from './gerber-parser-warning';
import { standardApertureOutline } from './gerber-standard-outline';
import { rewriteMacroUnaryMinus } from './gerber-unary-minus';
import type {
	GerberCommand,
	GerberOutline,
	GerberOutlineResult,
	GerberPadPrimitive,
	GerberPathSegment,
	GerberPlotterObject,
	GerberPoint,
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
}

/** One import error; `line` is 1-based, 0 when the problem concerns the whole file. */
export interface GerberImportError {
	line: number;
	message: string;
}

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
}

/** A failed import: every error found, sorted by line. */
export interface GerberImportFailure {
	errors: GerberImportError[];
}

/** The result of `importGerberPasteLayer`. */
export type GerberImportResult = GerberImportSuccess | GerberImportFailure;

interface SyncParser {
	line: number;
	format: { filetype: string | null };
	parseSync(text: string): GerberCommand[];
	on(event: 'warning', listener: (w: { message: string; line: number }) => void): unknown;
}

interface ObjectPlotter {
	write(chunk: GerberCommand): boolean;
	read(): GerberPlotterObject | null;
	on(event: 'warning', listener: (w: { message: string; line: number }) => void): unknown;
}

/** A dark or clear image object collected from the plotter, in file units. */
interface Placed {
	line: number;
	seq: number;
	clear: boolean;
	offsets: GerberPoint[];
}

interface Flash extends Placed {
	tool: string;
	x: number;
	y: number;
}

interface Region extends Placed {
	path: GerberPathSegment[];
}

/** Plotter warnings that the checks below already turn into errors, or that concern draws. */
const PLOTTER_WARNINGS_HANDLED = [
	/^flash in region ignored$/,
	/^flash with unknown tool ignored$/,
	/^units not set/,
	/^tool .* is not defined$/,
	/^cannot change tool while region mode is on$/,
	/is not strokable; ignoring interpolate$/,
	/^cannot draw arc with non-circular tool/,
	/^ignoring extra command/
];

/** `line N, <what>: <message>`, the message format of the stencil modules. */
function at(line: number, what: string, message: string): string {
	return line > 0 ? `line ${line}, ${what}: ${message}` : `file, ${what}: ${message}`;
}

function roundUm(value: number): number {
	// 1e-4 µm is far below any Gerber resolution (1 nm in FS 2.6 mm) and removes float noise.
	const r = Math.round(value * 1e4) / 1e4;
	return r === 0 ? 0 : r;
}

function lineOf(text: string, index: number): { line: number; column: number } {
	let line = 1;
	let lineStart = 0;
	for (let i = 0; i < index; i++) {
		if (text.charCodeAt(i) === 10) {
			line++;
			lineStart = i + 1;
		}
	}
	return { line, column: index - lineStart + 1 };
}

/** Checks on the raw text before parsing: size, binary content, empty, not Gerber at all. */
function checkText(text: unknown, maxBytes: number): GerberImportError | null {
	if (typeof text !== 'string') {
		return { line: 0, message: at(0, 'input', `must be text (got ${typeof text})`) };
	}
	if (text.length > maxBytes) {
		const mb = (n: number) => (n / 1024 / 1024).toFixed(1);
		return {
			line: 0,
			message: at(0, 'size', `${mb(text.length)} MB is over the ${mb(maxBytes)} MB limit for a paste layer`)
		};
	}
	// NUL and other control characters (or U+FFFD from decoding binary) never occur in Gerber.
	const bad = /[\u0000-\u0008\u000B\u000E-\u001F\u007F\uFFFD]/.exec(text);
	if (bad) {
		const { line, column } = lineOf(text, bad.index);
		const code = bad[0].charCodeAt(0).toString(16).toUpperCase().padStart(4, '0');
		return {
			line,
			message: at(line, `column ${column}`, `binary data (U+${code}); this is not a text Gerber file`)
		};
	}
	if (text.trim() === '') return { line: 0, message: at(0, 'content', 'the file is empty') };
	if (!text.includes('*')) {
		return { line: 1, message: at(1, 'content', 'no "*"-terminated Gerber commands found; this is not a Gerber file') };
	}
	return null;
}

function outlineToAperture(o: GerberOutline, x: number, y: number, f: number): ApertureInput {
	const base = { refdes: '', pad: '', xUm: roundUm((x + o.cx) * f), yUm: roundUm((y + o.cy) * f) };
	if (o.kind === 'circle') {
		return { ...base, shape: 'circle', diameterUm: roundUm(o.diameter * f), rotationDeg: 0 };
	}
	if (o.kind === 'rectangle') {
		const rounded = o.cornerRadius > 0;
		return {
			...base,
			shape: rounded ? 'rounded-rectangle' : 'rectangle',
			lengthUm: roundUm(o.length * f),
			widthUm: roundUm(o.width * f),
			...(rounded ? { cornerRadiusUm: roundUm(o.cornerRadius * f) } : {}),
			rotationDeg: o.rotationDeg
		};
	}
	return {
		...base,
		shape: 'polygon',
		verticesUm: o.vertices.map((v) => [roundUm(v[0] * f), roundUm(v[1] * f)] as PointUm),
		rotationDeg: o.rotationDeg
	};
}

/** Bounding box [xmin, ymin, xmax, ymax] of an outline placed at (x, y), file units. */
function outlineBox(o: GerberOutline, x: number, y: number): number[] {
	const cx = x + o.cx;
	const cy = y + o.cy;
	if (o.kind === 'circle') return [cx - o.diameter / 2, cy - o.diameter / 2, cx + o.diameter / 2, cy + o.diameter / 2];
	const local: GerberPoint[] =
		o.kind === 'polygon'
			? o.vertices
			: [
					[-o.length / 2, -o.width / 2],
					[o.length / 2, o.width / 2],
					[-o.length / 2, o.width / 2],
					[o.length / 2, -o.width / 2]
				];
	const a = (o.rotationDeg * Math.PI) / 180;
	const pts = local.map(([u, v]) => [cx + u * Math.cos(a) - v * Math.sin(a), cy + u * Math.sin(a) + v * Math.cos(a)]);
	const xs = pts.map((p) => p[0]);
	const ys = pts.map((p) => p[1]);
	return [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)];
}

function boxesOverlap(a: number[], b: number[]): boolean {
	return a[0] < b[2] && b[0] < a[2] && a[1] < b[3] && b[1] < a[3];
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
 *   center/vector lines → rotated rectangle, several → verified convex hull polygon).
 * - Regions (G36/G37): each contour becomes a polygon placed at its area centroid; arcs are cut
 *   into chords within `arcToleranceUm` (see `flattenGerberPath`).
 * - Step-repeat (%SR) copies are expanded. Draws (D01 outside a region), clear-polarity
 *   objects, moiré/thermal macros and apertures with holes are skipped with a warning.
 * - Names: refdes `@0001`, `@0002`, … sorted by y then x, pad `1` (`nameGerberApertures`).
 *
 * Errors (each with its 1-based line): size limit, binary data, not Gerber, unknown or
 * geometry-changing commands (%MI, %OF, %LR …), units (%MO) or format (%FS) missing, an
 * undefined aperture or macro, flashes or aperture changes inside a region, an unclosed region,
 * incremental coordinates, a missing M02 (truncated file), no flashes or regions at all.
 *
 * Reference: Gerber Layer Format Specification (Ucamco), revision 2023.08 or any since 2013.
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
	const toleranceUm = options.arcToleranceUm ?? GERBER_ARC_TOLERANCE_UM;
	if (!(toleranceUm > 0) || !Number.isFinite(toleranceUm)) {
		return { errors: [{ line: 0, message: at(0, 'arcToleranceUm', `must be a positive number (got ${toleranceUm})`) }] };
	}
	const textProblem = checkText(text, maxBytes);
	if (textProblem) return { errors: [textProblem] };

	const errors: GerberImportError[] = [];
	const warnings: { line: number; message: string }[] = [];
	const fail = (line: number, what: string, message: string) => {
		errors.push({ line, message: at(line, what, message) });
	};
	const warn = (line: number, what: string, message: string) => {
		warnings.push({ line, message: at(line, what, message) });
	};

	// Parse. The parser numbers lines from 0; everything below reports 1-based lines.
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
		return { errors: [{ line: parser.line + 1, message: at(parser.line + 1, 'parse', message) }] };
	}
	if (parser.format.filetype !== 'gerber') {
		return { errors: [{ line: 1, message: at(1, 'content', 'this looks like an NC drill file, not a Gerber layer') }] };
	}
	for (const w of parserWarnings) {
		const action = classifyGerberParserWarning(w.message);
		if (action.kind === 'error') fail(w.line + 1, 'command', action.message);
		if (action.kind === 'warning') warn(w.line + 1, 'parser', action.message);
	}

	// Drive the plotter one command at a time; write/read on an object-mode Transform run
	// synchronously, so each output object belongs to the command just written.
	const plotter = gerberPlotter({}) as unknown as ObjectPlotter;
	let line = 1;
	let inRegion = false;
	let regionLine = 0;
	plotter.on('warning', (w) => {
		if (PLOTTER_WARNINGS_HANDLED.some((re) => re.test(w.message))) return;
		if (/impossible arc/.test(w.message)) {
			if (inRegion) fail(line, 'arc', 'the arc centre offset (I, J) does not fit its start and end points');
			return;
		}
		warn(line, 'plotter', w.message);
	});

	let units: GerberUnits | null = null;
	let unitsReported = false;
	let formatSeen = false;
	let clear = false;
	let offsets: GerberPoint[] = [[0, 0]];
	const tools = new Map<string, { line: number; standard: GerberOutlineResult | null }>();
	const macros = new Set<string>();
	let currentTool: string | null = null;
	// After an undefined aperture is selected, its flashes are not reported again.
	let selectionFailed = false;
	let lastOp: 'int' | 'move' | 'flash' | null = null;
	let doneLine = 0;
	let draws = 0;
	let firstDrawLine = 0;
	const shapes = new Map<string, GerberPadPrimitive[]>();
	const flashes: Flash[] = [];
	const regions: Region[] = [];
	const requireUnits = (what: string) => {
		if (units || unitsReported) return;
		unitsReported = true;
		fail(line, what, 'units are not set; %MOMM*% or %MOIN*% must come first');
	};

	for (let seq = 0; seq < commands.length && errors.length <= MAX_ERRORS; seq++) {
		let cmd = commands[seq];
		line = cmd.line + 1;
		let closesRegion = false;
		if (cmd.type === 'set') {
			const v = cmd.value;
			if (cmd.prop === 'units') units = v as GerberUnits;
			else if (cmd.prop === 'backupUnits' && !units) {
				units = v as GerberUnits;
				warn(line, 'G70/G71', `deprecated unit command; using ${units}`);
			} else if ((cmd.prop === 'nota' || cmd.prop === 'backupNota') && v === 'I') {
				fail(line, 'notation', 'incremental coordinates (deprecated) are not supported; use absolute');
			} else if (cmd.prop === 'epsilon') formatSeen = true;
			else if (cmd.prop === 'region') {
				if (v === true) {
					if (inRegion) fail(line, 'G36', 'region started inside another region');
					inRegion = true;
					regionLine = line;
				} else if (!inRegion) {
					warn(line, 'G37', 'region end without a region start; ignored');
				} else {
					inRegion = false;
					closesRegion = true;
				}
			} else if (cmd.prop === 'tool') {
				const code = String(v);
				if (inRegion) fail(line, `D${code}`, 'aperture change inside a region (G36/G37)');
				else if (!tools.has(code)) {
					fail(line, `D${code}`, `aperture D${code} is not defined (no %ADD${code}…*% before it)`);
					currentTool = null;
					selectionFailed = true;
				} else {
					currentTool = code;
					selectionFailed = false;
				}
			}
		} else if (cmd.type === 'tool') {
			requireUnits(`%ADD${cmd.code}`);
			const def = cmd.tool;
			const what = `%ADD${cmd.code}`;
			if (!def.params.every((p) => Number.isFinite(p))) {
				fail(line, what, 'aperture parameters must be numbers');
			} else if (['circle', 'rect', 'obround', 'poly'].includes(def.shape)) {
				try {
					tools.set(cmd.code, { line, standard: standardApertureOutline(def) });
				} catch (e) {
					fail(line, what, e instanceof Error ? e.message : String(e));
				}
			} else if (!macros.has(def.shape)) {
				fail(line, what, `macro "${def.shape}" is not defined (no %AM${def.shape}*…% before it)`);
			} else tools.set(cmd.code, { line, standard: null });
		} else if (cmd.type === 'macro') {
			macros.add(cmd.name);
			// An unknown primitive leaves a hole in the block list (already an error via the
			// parser warning); drop it so the plotter does not trip over it.
			cmd = { ...cmd, blocks: cmd.blocks.filter((b) => b !== undefined) };
		} else if (cmd.type === 'level') {
			if (inRegion) fail(line, '%LP/%SR', 'polarity or step-repeat change inside a region');
			if (cmd.level === 'polarity') clear = cmd.value === 'C';
		} else if (cmd.type === 'op') {
			requireUnits('operation');
			const op: 'int' | 'move' | 'flash' | null = cmd.op === 'last' ? lastOp : cmd.op;
			if (op === null) fail(line, 'coordinate', 'coordinates without D01/D02/D03 and no earlier operation');
			if (op === 'flash') {
				if (inRegion) fail(line, 'D03', 'flash inside a region (G36/G37)');
				else if (currentTool === null && !selectionFailed) fail(line, 'D03', 'flash with no aperture selected');
			}
			if (op === 'int' && !inRegion) {
				draws++;
				if (firstDrawLine === 0) firstDrawLine = line;
			}
			lastOp = op;
		} else if (cmd.type === 'done') {
			doneLine = line;
		}

		try {
			plotter.write(cmd);
			for (let out = plotter.read(); out !== null; out = plotter.read()) {
				if (out.type === 'shape') shapes.set(out.tool, out.shape);
				else if (out.type === 'pad' && currentTool !== null) {
					flashes.push({ tool: out.tool, x: out.x, y: out.y, line, seq, clear, offsets });
				} else if (out.type === 'fill' && closesRegion) {
					regions.push({ path: out.path, line: regionLine, seq, clear, offsets });
				} else if (out.type === 'repeat') {
					offsets = out.offsets.length > 0 ? out.offsets : [[0, 0]];
				}
				// Strokes and the fills of rectangular draws are draws: counted above, skipped.
			}
		} catch (e) {
			fail(line, 'plot', `could not be drawn (${e instanceof Error ? e.message : String(e)})`);
		}
		if (doneLine) break;
	}

	// The last line with content: where a truncated file stops.
	const lastLine = text.trimEnd().split('\n').length;
	if (!units && !unitsReported) fail(1, 'units', 'units are not set; the file has no %MOMM*% or %MOIN*%');
	if (!formatSeen) fail(1, 'format', 'the coordinate format statement (%FS…*%) is missing');
	if (inRegion) fail(regionLine, 'G36', 'the region is never closed with G37');
	if (!doneLine) fail(lastLine, 'end', 'the file ends without M02; it may be truncated');
	if (errors.length === 0 && flashes.length === 0 && regions.length === 0) {
		const drawNote = draws > 0 ? ` (${draws} draw(s) with D01 found; a paste layer needs flashes or regions)` : '';
		fail(0, 'content', `no flashes (D03) or regions (G36/G37) found: nothing to import${drawNote}`);
	}
	if (errors.length > 0) return failure(errors);

	// Geometry, in file units until `outlineToAperture` scales by f.
	const f = units === 'in' ? MICROMETRES_PER.inch : MICROMETRES_PER.mm;
	const tolerance = toleranceUm / f;
	const outlines = new Map<string, GerberOutlineResult>();
	const skipped = new Map<string, { count: number; firstLine: number }>();
	const dark: { aperture: ApertureInput; box: number[]; seq: number; line: number }[] = [];
	const clearBoxes: { box: number[]; seq: number; line: number }[] = [];
	let flashCount = 0;
	let contourCount = 0;
	let clearCount = 0;

	for (const fl of flashes) {
		let result = outlines.get(fl.tool);
		if (!result) {
			result = tools.get(fl.tool)?.standard ?? macroShapeOutline(shapes.get(fl.tool) ?? [], tolerance);
			outlines.set(fl.tool, result);
		}
		if ('skipReason' in result) {
			const s = skipped.get(fl.tool) ?? { count: 0, firstLine: fl.line };
			skipped.set(fl.tool, { count: s.count + fl.offsets.length, firstLine: s.firstLine });
			continue;
		}
		for (const [ox, oy] of fl.offsets) {
			const box = outlineBox(result.outline, fl.x + ox, fl.y + oy);
			if (fl.clear) {
				clearBoxes.push({ box, seq: fl.seq, line: fl.line });
				clearCount++;
				continue;
			}
			dark.push({ aperture: outlineToAperture(result.outline, fl.x + ox, fl.y + oy, f), box, seq: fl.seq, line: fl.line });
			flashCount++;
		}
	}
	for (const [tool, s] of skipped) {
		const definedAt = tools.get(tool)?.line ?? 0;
		const reason = (outlines.get(tool) as { skipReason: string }).skipReason;
		warn(s.firstLine, `D${tool}`, `aperture D${tool} (defined at line ${definedAt}) ${reason}; ${s.count} flash(es) skipped`);
	}

	for (const region of regions) {
		const contours = flattenGerberPath(region.path, tolerance);
		contours.forEach((contour, k) => {
			const what = `G36 contour ${k + 1}`;
			if (!contour.closed) {
				fail(region.line, what, 'the contour is not closed (its last point differs from its first)');
				return;
			}
			const vertices = contour.vertices as PointUm[];
			if (vertices.length < 3 || polygonSignedArea(vertices) === 0) {
				warn(region.line, what, 'the contour has zero area; skipped');
				return;
			}
			if (vertices.length <= 2000 && findSelfIntersection(vertices)) {
				warn(region.line, what, 'the contour crosses or touches itself (e.g. a cut-in); its outline may be rejected');
			}
			const [cx, cy] = polygonCentroid(vertices);
			const outline: GerberOutline = {
				kind: 'polygon',
				vertices: vertices.map(([x, y]) => [x - cx, y - cy]),
				cx,
				cy,
				rotationDeg: 0
			};
			for (const [ox, oy] of region.offsets) {
				const box = outlineBox(outline, ox, oy);
				if (region.clear) {
					clearBoxes.push({ box, seq: region.seq, line: region.line });
					clearCount++;
					continue;
				}
				dark.push({ aperture: outlineToAperture(outline, ox, oy, f), box, seq: region.seq, line: region.line });
				contourCount++;
			}
		});
	}
	if (errors.length > 0) return failure(errors);

	// Clear polarity only cuts what was drawn before it; Rollbead cannot cut, so say where.
	for (const c of clearBoxes) {
		const hit = dark.filter((d) => d.seq < c.seq && boxesOverlap(d.box, c.box));
		if (hit.length > 0) {
			warn(
				c.line,
				'%LPC',
				`a clear-polarity object overlaps ${hit.length} earlier aperture(s) (first from line ${hit[0].line}); the cut-out is ignored, so their areas are overstated`
			);
		}
	}
	if (clearCount > 0) warn(0, '%LPC', `${clearCount} clear-polarity object(s) skipped`);
	if (draws > 0) {
		warn(firstDrawLine, 'D01', `${draws} draw(s) outside regions skipped; a paste layer should hold only flashes and regions`);
	}
	if (dark.length === 0) {
		// The reasons are in the warnings; without apertures they become the errors.
		return failure([
			{ line: 0, message: at(0, 'content', 'no usable apertures: every flash and region was skipped') },
			...warnings
		]);
	}

	const flashesSkipped = [...skipped.values()].reduce((sum, s) => sum + s.count, 0);
	return {
		apertures: nameGerberApertures(dark.map((d) => d.aperture)),
		warnings: warnings.sort((a, b) => a.line - b.line).map((w) => w.message),
		units: units as GerberUnits,
		counts: { flashes: flashCount, regionContours: contourCount, flashesSkipped, drawsSkipped: draws }
	};
}

function failure(errors: GerberImportError[]): GerberImportFailure {
	const sorted = [...errors].sort((a, b) => a.line - b.line);
	if (sorted.length <= MAX_ERRORS) return { errors: sorted };
	const rest = sorted.length - MAX_ERRORS;
	return { errors: [...sorted.slice(0, MAX_ERRORS), { line: 0, message: at(0, 'errors', `${rest} more not listed`) }] };
}
