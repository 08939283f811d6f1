/**
 * First stage of the Gerber import: check the parsed command stream and collect what a paste
 * layer is made of (flashes and regions, with their step-repeat offsets and polarity) from
 * `gerber-plotter`, which evaluates macros and builds region paths including arcs.
 */
import gerberPlotter from 'gerber-plotter';
import { gerberProblem, type GerberProblem } from './gerber-message';
import { standardApertureOutline } from './gerber-standard-outline';
import { DEFAULT_STENCIL_LIMITS, formatCount, type StencilLimits } from './limits';
import type { GerberDraw } from './gerber-draws';
import type {
	GerberCommand,
	GerberOutlineResult,
	GerberPadPrimitive,
	GerberPathSegment,
	GerberPlotterObject,
	GerberPoint,
	GerberUnits
} from './gerber-types';

interface ObjectPlotter {
	write(chunk: GerberCommand): boolean;
	read(): GerberPlotterObject | null;
	on(event: 'warning', listener: (w: { message: string; line: number }) => void): unknown;
}

/** An image object in file units: where it comes from, its polarity and step-repeat copies. */
export interface GerberPlaced {
	/** 1-based line of the flash, or of the G36 that opened the region. */
	line: number;
	/** Index of the command, to order clear objects after the dark ones they cut. */
	seq: number;
	clear: boolean;
	/** Step-repeat offsets; [[0, 0]] when there is no step-repeat. */
	offsets: GerberPoint[];
}

/** A flash of aperture `tool` at (x, y). */
export interface GerberFlash extends GerberPlaced {
	tool: string;
	x: number;
	y: number;
}

/** A region (G36/G37) and its path. */
export interface GerberRegion extends GerberPlaced {
	path: GerberPathSegment[];
}

/** Everything the importer needs from a checked command stream. */
export interface GerberImage {
	units: GerberUnits | null;
	flashes: GerberFlash[];
	regions: GerberRegion[];
	/** Aperture definitions: line, and the outline of a standard aperture (null for macros). */
	tools: Map<string, { line: number; standard: GerberOutlineResult | null }>;
	/** Macro pad shapes as evaluated by the plotter, by D-code. */
	shapes: Map<string, GerberPadPrimitive[]>;
	draws: number;
	firstDrawLine: number;
	/** The draws (D01 outside regions) with their pens, for `importDraws`. */
	strokes: GerberDraw[];
	errors: GerberProblem[];
	warnings: GerberProblem[];
	/** Openings the flashes and regions make, step-and-repeat copies included (before skips). */
	openings: number;
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

const STANDARD_SHAPES = ['circle', 'rect', 'obround', 'poly'];

/**
 * Check a `gerber-parser` command stream and collect its flashes and regions by driving
 * `gerber-plotter` one command at a time (write/read on an object-mode Transform run
 * synchronously, so each output belongs to the command just written and keeps its line).
 * Stops after `maxErrors` errors. Used by `importGerberPasteLayer`.
 * Reference: Gerber Layer Format Specification (Ucamco): operations D01/D02/D03, regions
 * G36/G37, polarity %LP, step-repeat %SR, units %MO, format %FS, end of file M02.
 * @param lastLine 1-based number of the last non-empty line, where a truncated file stops.
 * @example readGerberImage(parser.parseSync(text), 23, 50).flashes.length // 5
 */
export function readGerberImage(
	commands: readonly GerberCommand[],
	lastLine: number,
	maxErrors: number,
	limits: StencilLimits = DEFAULT_STENCIL_LIMITS
): GerberImage {
	const errors: GerberProblem[] = [];
	const warnings: GerberProblem[] = [];
	const fail = (at: number, what: string, message: string) => {
		errors.push(gerberProblem(at, what, message));
	};
	const warn = (at: number, what: string, message: string) => {
		warnings.push(gerberProblem(at, what, message));
	};

	const plotter = gerberPlotter({}) as unknown as ObjectPlotter;
	let line = 1;
	let inRegion = false;
	let regionLine = 0;
	plotter.on('warning', (w) => {
		if (PLOTTER_WARNINGS_HANDLED.some((re) => re.test(w.message))) return;
		if (/impossible arc/.test(w.message)) {
			const message = 'the arc centre offset (I, J) does not fit its start and end points';
			if (inRegion) fail(line, 'arc', message);
			return;
		}
		warn(line, 'plotter', w.message);
	});

	let units: GerberUnits | null = null;
	let unitsReported = false;
	let formatSeen = false;
	let clear = false;
	let offsets: GerberPoint[] = [[0, 0]];
	const tools: GerberImage['tools'] = new Map();
	const macros = new Set<string>();
	let currentTool: string | null = null;
	// After an undefined aperture is selected, its flashes are not reported again.
	let selectionFailed = false;
	let lastOp: 'int' | 'move' | 'flash' | null = null;
	let doneLine = 0;
	let draws = 0;
	let firstDrawLine = 0;
	const strokes: GerberDraw[] = [];
	// The current point and interpolation state, so each draw keeps its own line.
	let point: GerberPoint = [0, 0];
	let mode: 'i' | 'cw' | 'ccw' = 'i';
	let quadrant: 'single' | 'multi' = 'multi';
	const shapes = new Map<string, GerberPadPrimitive[]>();
	const flashes: GerberFlash[] = [];
	const regions: GerberRegion[] = [];
	// Budgets, counted before the plotter builds anything (see `limits.ts`).
	let openings = 0;
	let copies = 1;
	let regionSegments = 0;
	let overBudget = false;
	const budget = (at: number, what: string, message: string) => {
		overBudget = true;
		errors.push({ ...gerberProblem(at, what, message), budget: true });
	};
	// Only round and (deprecated) rectangular standard apertures can draw (specification,
	// "Apertures"); others draw nothing here.
	const penOf = (tool: string | null): GerberDraw['pen'] => {
		const std = tool === null ? null : tools.get(tool)?.standard;
		if (!std || !('outline' in std)) return null;
		const o = std.outline;
		if (o.kind === 'circle') return { kind: 'circle', diameter: o.diameter };
		if (o.kind === 'rectangle' && o.cornerRadius === 0 && o.rotationDeg === 0)
			return { kind: 'rect', x: o.length, y: o.width };
		return null;
	};
	const requireUnits = (what: string) => {
		if (units || unitsReported) return;
		unitsReported = true;
		fail(line, what, 'units are not set; %MOMM*% or %MOIN*% must come first');
	};

	for (let seq = 0; seq < commands.length && errors.length < maxErrors && !overBudget; seq++) {
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
				fail(line, 'notation', 'incremental coordinates (deprecated) are not supported');
			} else if (cmd.prop === 'epsilon') formatSeen = true;
			else if (cmd.prop === 'mode') mode = v as 'i' | 'cw' | 'ccw';
			else if (cmd.prop === 'arc') quadrant = v === 's' ? 'single' : 'multi';
			else if (cmd.prop === 'region') {
				if (v === true) {
					if (inRegion) fail(line, 'G36', 'region started inside another region');
					inRegion = true;
					regionLine = line;
					regionSegments = 0;
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
					const message = `aperture D${code} is not defined (no %ADD${code}…*% before it)`;
					fail(line, `D${code}`, message);
					currentTool = null;
					selectionFailed = true;
				} else {
					currentTool = code;
					selectionFailed = false;
				}
			}
		} else if (cmd.type === 'tool') {
			const what = `%ADD${cmd.code}`;
			requireUnits(what);
			const def = cmd.tool;
			const earlier = tools.get(cmd.code);
			if (earlier) {
				// Redefining a D-code would make earlier and later flashes ambiguous.
				fail(line, what, `aperture D${cmd.code} is already defined at line ${earlier.line}`);
			} else if (!def.params.every((p) => Number.isFinite(p))) {
				fail(line, what, 'aperture parameters must be numbers');
			} else if (STANDARD_SHAPES.includes(def.shape)) {
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
			if (cmd.level === 'stepRep') {
				const v = cmd.value as { x?: number; y?: number } | null;
				copies = v && typeof v.x === 'number' && typeof v.y === 'number' ? v.x * v.y : 1;
				// The plotter makes the offset list at once: refuse before it does.
				if (!(copies <= limits.maxOpeningsPerLayer)) {
					budget(
						line,
						'%SR',
						`step-and-repeat asks for ${formatCount(copies)} copies; ` +
							`the limit is ${formatCount(limits.maxOpeningsPerLayer)} openings per layer`
					);
					break;
				}
			}
		} else if (cmd.type === 'op') {
			requireUnits('operation');
			const op: 'int' | 'move' | 'flash' | null = cmd.op === 'last' ? lastOp : cmd.op;
			if (op === null) {
				fail(line, 'coordinate', 'coordinates without D01/D02/D03 and no earlier operation');
			}
			if (op === 'int' && inRegion && ++regionSegments > limits.maxRegionSegments) {
				const message =
					`the region opened at line ${regionLine} has more than ` +
					`${formatCount(limits.maxRegionSegments)} segments`;
				budget(line, 'G36', message);
				break;
			}
			if (op === 'flash' || (op === 'int' && inRegion && regionSegments === 1)) {
				// Each flash, and each region, makes one opening per step-and-repeat copy.
				openings += copies;
				if (openings > limits.maxOpeningsPerLayer) {
					const message =
						`the layer makes more than ${formatCount(limits.maxOpeningsPerLayer)} openings ` +
						`(step-and-repeat copies included); the limit is ` +
						`${formatCount(limits.maxOpeningsPerLayer)} openings per layer`;
					budget(line, op === 'flash' ? 'D03' : 'G36', message);
					break;
				}
			}
			if (op === 'flash') {
				if (inRegion) fail(line, 'D03', 'flash inside a region (G36/G37)');
				else if (currentTool === null && !selectionFailed) {
					fail(line, 'D03', 'flash with no aperture selected');
				}
			}
			const next: GerberPoint = [cmd.coord.x ?? point[0], cmd.coord.y ?? point[1]];
			if (op === 'int' && !inRegion) {
				draws++;
				if (firstDrawLine === 0) firstDrawLine = line;
				if (draws * copies > limits.maxDrawSegmentsPerLayer) {
					budget(
						line,
						'D01',
						`the layer has more than ${formatCount(limits.maxDrawSegmentsPerLayer)} draws ` +
							`(step-and-repeat copies included); the limit is ` +
							`${formatCount(limits.maxDrawSegmentsPerLayer)} stroke segments per layer`
					);
					break;
				}
				const arc =
					mode === 'i' ? null : { i: cmd.coord.i ?? 0, j: cmd.coord.j ?? 0, dir: mode, quadrant };
				strokes.push({
					line,
					seq,
					clear,
					offsets,
					start: point,
					end: next,
					pen: penOf(currentTool),
					arc
				});
			}
			point = next;
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

	const image = {
		units,
		flashes,
		regions,
		tools,
		shapes,
		draws,
		firstDrawLine,
		strokes,
		errors,
		warnings
	};
	// Over a budget the rest of the file was not read: the end checks would only add noise.
	if (overBudget) return { ...image, openings };
	if (!units && !unitsReported) {
		fail(1, 'units', 'units are not set; the file has no %MOMM*% or %MOIN*%');
	}
	if (!formatSeen) fail(1, 'format', 'the coordinate format statement (%FS…*%) is missing');
	if (inRegion) fail(regionLine, 'G36', 'the region is never closed with G37');
	if (!doneLine) fail(lastLine, 'end', 'the file ends without M02; it may be truncated');
	if (errors.length === 0 && flashes.length === 0 && regions.length === 0 && draws === 0) {
		const drawNote =
			draws > 0 ? ` (${draws} draw(s) with D01 found; a paste layer needs flashes or regions)` : '';
		fail(0, 'content', `no flashes (D03) or regions (G36/G37) found: nothing to import${drawNote}`);
	}
	return {
		units,
		flashes,
		regions,
		tools,
		shapes,
		draws,
		firstDrawLine,
		strokes,
		errors,
		warnings,
		openings
	};
}
