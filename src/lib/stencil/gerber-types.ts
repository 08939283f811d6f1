/**
 * Types for the Gerber importer: the command objects emitted by `gerber-parser` 4.x and the
 * image objects emitted by `gerber-plotter` 4.x (both tracespace v4, documented in their
 * API.md), plus the importer's own intermediate outline type. Only the fields Rollbead reads
 * are declared; the packages ship `index.d.ts` files, but those omit `parseSync` and the
 * command objects, so the importer uses these narrower types instead.
 */

/** A point [x, y] in Gerber file units (mm or in). */
export type GerberPoint = [number, number];

/** Units of a Gerber file, from `%MOMM*%` / `%MOIN*%` (or the deprecated G71 / G70). */
export type GerberUnits = 'mm' | 'in';

/** One macro block as produced by the parser; numbers may be functions of the `$n` modifiers. */
export interface GerberMacroBlock {
	type: string;
	exp?: unknown;
	[key: string]: unknown;
}

/** A standard or macro aperture definition (`%ADDnn...*%`). */
export interface GerberToolDefinition {
	/** `circle`, `rect`, `obround`, `poly`, or a macro name. */
	shape: string;
	/** C: [dia]; R/O: [x, y]; P: [dia, vertices, rotationDeg]; macro: [$1, $2, ...]. */
	params: number[];
	/** Hole: [] none, [dia] round, [x, y] rectangular (deprecated). */
	hole: number[];
}

/** A command object from `gerber-parser`; `line` is 0-based. */
export type GerberCommand =
	| { type: 'set'; line: number; prop: string; value: unknown }
	| { type: 'op'; line: number; op: 'int' | 'move' | 'flash' | 'last'; coord: GerberCoord }
	| { type: 'level'; line: number; level: 'polarity' | 'stepRep'; value: unknown }
	| { type: 'tool'; line: number; code: string; tool: GerberToolDefinition }
	| { type: 'macro'; line: number; name: string; blocks: (GerberMacroBlock | undefined)[] }
	| { type: 'done'; line: number };

/** Coordinates of an operation, already scaled to file units by the parser. */
export interface GerberCoord {
	x?: number;
	y?: number;
	i?: number;
	j?: number;
	a?: number;
}

/** A primitive of a flashed pad shape, relative to the aperture origin (plotter output). */
export type GerberPadPrimitive =
	| { type: 'circle'; r: number; cx: number; cy: number }
	| { type: 'rect'; width: number; height: number; r: number; cx: number; cy: number }
	| { type: 'poly'; points: GerberPoint[] }
	| { type: 'ring'; r: number; width: number; cx: number; cy: number }
	| { type: 'clip'; shape: unknown[]; clip: unknown }
	| { type: 'layer'; polarity: 'dark' | 'clear'; box: number[] };

/** A segment of a plotted path (plotter output); arc angles are in radians. */
export type GerberPathSegment =
	| { type: 'line'; start: GerberPoint; end: GerberPoint }
	| {
			type: 'arc';
			start: [number, number, number];
			end: [number, number, number];
			center: GerberPoint;
			sweep: number;
			radius: number;
			dir: 'cw' | 'ccw';
	  };

/** An image object emitted by the plotter. */
export type GerberPlotterObject =
	| { type: 'shape'; tool: string; shape: GerberPadPrimitive[] }
	| { type: 'pad'; tool: string; x: number; y: number }
	| { type: 'fill'; path: GerberPathSegment[] }
	| { type: 'stroke'; width: number; path: GerberPathSegment[] }
	| { type: 'polarity'; polarity: 'dark' | 'clear'; box: number[] }
	| { type: 'repeat'; offsets: GerberPoint[]; box: number[] }
	| { type: 'size'; box: number[]; units: GerberUnits };

/**
 * One aperture outline in file units, before conversion to µm. `(cx, cy)` is the outline's
 * reference point relative to the flash point (for a region, relative to the file origin);
 * polygon `vertices` are relative to `(cx, cy)` before rotation by `rotationDeg` (CCW).
 */
export type GerberOutline =
	| { kind: 'circle'; diameter: number; cx: number; cy: number }
	| {
			kind: 'rectangle';
			length: number;
			width: number;
			cornerRadius: number;
			cx: number;
			cy: number;
			rotationDeg: number;
	  }
	| { kind: 'polygon'; vertices: GerberPoint[]; cx: number; cy: number; rotationDeg: number };

/** Either an outline or the reason an aperture cannot be represented (becomes a warning). */
export type GerberOutlineResult = { outline: GerberOutline } | { skipReason: string };
