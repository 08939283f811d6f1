/**
 * The one message format of the Gerber importer, following the stencil modules'
 * `<where>, <field>: <message>` (see `formatProblem` in `stencil-input-error.ts`): where is
 * `line N` (1-based) or `file` for the whole file, field is the command concerned.
 */

/** One import problem; `line` is 1-based, 0 when it concerns the whole file. */
export interface GerberProblem {
	line: number;
	message: string;
	/** Set when a work budget (`limits.ts`) was exceeded: answered 413, not 422. */
	budget?: boolean;
}

/**
 * Format a Gerber import message: `line N, <what>: <message>`, or `file, <what>: <message>`
 * when `line` is 0.
 * @example gerberMessage(12, 'D15', 'aperture D15 is not defined') // 'line 12, D15: aperture D15 is not defined'
 * @example gerberMessage(0, 'size', 'too big') // 'file, size: too big'
 */
export function gerberMessage(line: number, what: string, message: string): string {
	return line > 0 ? `line ${line}, ${what}: ${message}` : `file, ${what}: ${message}`;
}

/**
 * A problem object with its formatted message.
 * @example gerberProblem(3, '%ADD10', 'bad') // { line: 3, message: 'line 3, %ADD10: bad' }
 */
export function gerberProblem(line: number, what: string, message: string): GerberProblem {
	return { line, message: gerberMessage(line, what, message) };
}
