/**
 * Strict first pass over the raw text of a Gerber file, before `gerber-parser` sees it. The
 * parser reads numbers loosely (`C,1e308` became 1 mm, a 40-digit coordinate was clamped, `0x10`
 * became 0) and counts nothing, so this pass reads every number the way the format writes it
 * and counts what the file will make (step-and-repeat copies, aperture and macro definitions,
 * macro primitives, outline vertices), refusing before any of it is built. Linear in the text.
 * Reference: Gerber Layer Format Specification (Ucamco), revision 2022.02: data blocks end with
 * `*`, extended commands are enclosed in `%`; coordinate data are integers with the digits the
 * `%FS` statement declares; aperture and macro parameters are decimals (no exponent).
 */
import { gerberProblem, type GerberProblem } from './gerber-message';
import { formatCount, NUMBER_RANGES, type StencilLimits } from './limits';

/** A decimal as the format writes it: sign, digits, optional point; no exponent, no hex. */
const DECIMAL_RE = /^[+-]?(\d+\.?\d*|\.\d+)$/;
/** Characters a macro primitive may hold: decimals, `$n` variables, operators, brackets. */
const MACRO_CHARS_RE = /^[0-9.$+\-xX/()=,\s]*$/;
/** Micrometres per file unit. */
const UM_PER = { mm: 1000, in: 25_400 } as const;

interface Format {
	line: number;
	trailing: boolean;
	x: [number, number];
	y: [number, number];
}

/** What the scan learned, for later budget checks; and the problems it found. */
export interface GerberScan {
	errors: GerberProblem[];
	/** Largest X × Y copy count of any `%SR` block (1 when there is none). */
	maxStepRepeatCopies: number;
}

const short = (s: string) => (s.length > 24 ? `${s.slice(0, 20)}…(${s.length} characters)` : s);

/**
 * Scan a Gerber text (already checked by `checkGerberText`) for loose numbers and for counts
 * over `limits`. Stops at `maxErrors` problems. Used first by `importGerberPasteLayer`.
 * @example scanGerberText('%FSLAX26Y26*%\n%MOMM*%\n%ADD10C,1e308*%\n', DEFAULT_STENCIL_LIMITS, 50).errors[0].message
 * // 'line 3, %ADD10: parameter 1 "1e308" is not a plain decimal number (digits, one point, no exponent)'
 */
export function scanGerberText(text: string, limits: StencilLimits, maxErrors: number): GerberScan {
	const errors: GerberProblem[] = [];
	const fail = (line: number, what: string, message: string) => {
		if (errors.length < maxErrors) errors.push(gerberProblem(line, what, message));
	};
	/** A count over a budget: the file asks for too much work (413), not a malformed one. */
	const over = (line: number, what: string, message: string) => {
		if (errors.length < maxErrors)
			errors.push({ ...gerberProblem(line, what, message), budget: true });
	};
	let format: Format | null = null;
	let units: keyof typeof UM_PER | null = null;
	let definitions = 0;
	let maxCopies = 1;
	let inExtended = false;
	let blockFirst = true; // the next word opens an extended block
	let macro: { name: string; line: number; primitives: number } | null = null;

	const checkSize = (line: number, what: string, k: number, raw: string, v: number) => {
		// Zero sizes are skipped with a warning later, negative ones refused by the outline code.
		if (!units || v <= 0) return;
		const um = v * UM_PER[units];
		if (um < NUMBER_RANGES.minApertureSizeUm || um > NUMBER_RANGES.maxApertureSizeUm)
			fail(
				line,
				what,
				`parameter ${k} (${raw} ${units}) is outside ${NUMBER_RANGES.minApertureSizeUm} µm..` +
					`${NUMBER_RANGES.maxApertureSizeUm / 1000} mm`
			);
	};

	const apertureDefinition = (line: number, word: string) => {
		const m = /^ADD(\d+)([^,]*)(?:,(.*))?$/s.exec(word);
		if (!m) return; // the parser words a malformed definition
		const what = `%ADD${short(m[1])}`;
		if (++definitions > limits.maxApertureDefinitions) {
			if (definitions === limits.maxApertureDefinitions + 1)
				over(
					line,
					what,
					`more than ${formatCount(limits.maxApertureDefinitions)} aperture definitions`
				);
			return;
		}
		if (m[3] === undefined) return;
		const raw = m[3].split('X').map((p) => p.trim());
		const values: number[] = [];
		for (let k = 0; k < raw.length; k++) {
			if (!DECIMAL_RE.test(raw[k])) {
				const got = JSON.stringify(short(raw[k]));
				fail(
					line,
					what,
					`parameter ${k + 1} ${got} is not a plain decimal number (digits, one point, no exponent)`
				);
				return;
			}
			values.push(Number(raw[k]));
		}
		const shape = m[2].trim();
		if (shape === 'C' || shape === 'R' || shape === 'O') {
			const sizes = shape === 'C' ? 1 : 2;
			for (let k = 0; k < values.length; k++)
				if (k < sizes || values[k] !== 0) checkSize(line, what, k + 1, raw[k], values[k]);
		} else if (shape === 'P') {
			checkSize(line, what, 1, raw[0], values[0]);
			const rotation = values[2];
			if (rotation !== undefined && Math.abs(rotation) > NUMBER_RANGES.maxRotationDeg)
				fail(line, what, `rotation ${raw[2]}° is outside -360..360°`);
			for (let k = 3; k < values.length; k++) checkSize(line, what, k + 1, raw[k], values[k]);
		}
	};

	const macroWord = (line: number, word: string) => {
		if (!macro) return;
		const what = `%AM${short(macro.name)}`;
		if (/^0(\s|$)/.test(word)) return; // comment primitive: free text
		macro.primitives++;
		if (macro.primitives === limits.maxMacroPrimitives + 1) {
			const message =
				`the macro has more than ${formatCount(limits.maxMacroPrimitives)} primitives; ` +
				`the limit is ${formatCount(limits.maxMacroPrimitives)} per macro`;
			over(macro.line, what, message);
			return;
		}
		if (!MACRO_CHARS_RE.test(word)) {
			const bad = /[^0-9.$+\-xX/()=,\s]/.exec(word);
			const message = `unexpected character ${JSON.stringify(bad?.[0])} in a primitive; numbers are plain decimals (no exponent)`;
			fail(line, what, message);
			return;
		}
		// The parser cannot read a definition of `$10` or higher (it loses the primitive): refuse
		// it by name rather than lose it. Using `$10` and up as a parameter works.
		const wide = /^\$(\d{2,})\s*=/.exec(word);
		if (wide) {
			const message = `defining $${wide[1]}: macro variables from $10 up cannot be defined here`;
			fail(line, what, message);
			return;
		}
		const fields = word.split(',').map((f) => f.trim());
		for (const f of fields)
			for (const literal of f.match(/\d*\.?\d+\.?\d*/g) ?? [])
				if (!DECIMAL_RE.test(literal)) {
					fail(line, what, `${JSON.stringify(short(literal))} is not a plain decimal number`);
					return;
				}
		// Outline (4) and polygon (5) primitives say how many vertices they make.
		const count = fields[0] === '4' || fields[0] === '5' ? Number(fields[2]) : NaN;
		if (Number.isFinite(count) && count > limits.maxOutlineVertices) {
			const message =
				`a primitive asks for ${formatCount(count)} vertices; ` +
				`the limit is ${formatCount(limits.maxOutlineVertices)} per outline`;
			over(line, what, message);
		}
	};

	const stepRepeat = (line: number, word: string) => {
		if (word === 'SR') return;
		const m = /^SRX([^Y]*)Y([^I]*)I([^J]*)J(.*)$/s.exec(word);
		if (!m) {
			fail(line, '%SR', `expected %SRX<count>Y<count>I<step>J<step>*% (got "${short(word)}")`);
			return;
		}
		const [x, y] = [m[1], m[2]];
		if (!/^\d+$/.test(x) || !/^\d+$/.test(y) || Number(x) < 1 || Number(y) < 1) {
			fail(
				line,
				'%SR',
				`the repeat counts X and Y must be whole numbers ≥ 1 (got X${short(x)} Y${short(y)})`
			);
			return;
		}
		for (const [axis, v] of [
			['I', m[3]],
			['J', m[4]]
		])
			if (!DECIMAL_RE.test(v) || Number(v) < 0)
				fail(
					line,
					'%SR',
					`the step ${axis} must be a plain decimal ≥ 0 (got ${JSON.stringify(short(v))})`
				);
		const copies = Number(x) * Number(y);
		maxCopies = Math.max(maxCopies, copies);
		if (copies > limits.maxOpeningsPerLayer)
			over(
				line,
				'%SR',
				`step-and-repeat asks for ${formatCount(copies)} copies; ` +
					`the limit is ${formatCount(limits.maxOpeningsPerLayer)} openings per layer`
			);
	};

	const coordinates = (line: number, column: number, word: string) => {
		if (!format) return;
		const body = word.replace(/^(G\d+)+/, '');
		// Coordinate data come before the D-code (or M-code) that ends the block.
		const data = body.split(/[DM]/)[0];
		const re = /([XYIJ])([^XYIJ]*)/g;
		for (let m = re.exec(data); m; m = re.exec(data)) {
			const [axis, raw] = [m[1], m[2]];
			const at = column + (word.length - body.length) + m.index;
			const what = `${axis} (column ${at})`;
			if (!/^[+-]?\d+$/.test(raw)) {
				const message = `coordinate ${JSON.stringify(short(raw))} is not a whole number in the %FS format`;
				fail(line, what, message);
				continue;
			}
			const [int, dec] = axis === 'X' || axis === 'I' ? format.x : format.y;
			const digits = raw.replace(/^[+-]/, '');
			if (digits.length > int + dec) {
				fail(
					line,
					what,
					`coordinate has ${digits.length} digits; %FS (line ${format.line}) declares ` +
						`${int} integer + ${dec} decimal digits`
				);
				continue;
			}
			const scaled = format.trailing ? digits.padEnd(int + dec, '0') : digits;
			const value = Number(scaled) / 10 ** dec;
			if (units && value * UM_PER[units] > NUMBER_RANGES.maxPositionUm)
				fail(line, what, `coordinate ${raw} is beyond ±${NUMBER_RANGES.maxPositionUm / 1000} mm`);
		}
	};

	const extendedWord = (line: number, word: string) => {
		if (blockFirst) {
			macro = null;
			if (word.startsWith('AM')) {
				macro = { name: word.slice(2), line, primitives: 0 };
				if (++definitions === limits.maxApertureDefinitions + 1)
					over(
						line,
						`%AM`,
						`more than ${formatCount(limits.maxApertureDefinitions)} aperture definitions`
					);
				blockFirst = false;
				return;
			}
		}
		blockFirst = false;
		if (macro) return macroWord(line, word);
		if (word.startsWith('FS')) {
			const m = /^FS([LTD]?)([AI])X(\d)(\d)Y(\d)(\d)$/.exec(word);
			if (m)
				format = {
					line,
					trailing: m[1] === 'T',
					x: [Number(m[3]), Number(m[4])],
					y: [Number(m[5]), Number(m[6])]
				};
		} else if (word === 'MOMM') units = 'mm';
		else if (word === 'MOIN') units = 'in';
		else if (word.startsWith('AD')) apertureDefinition(line, word);
		else if (word.startsWith('SR')) stepRepeat(line, word);
	};

	let line = 1;
	let lineStart = 0;
	let wordStart = -1; // index of the word's first non-blank character
	let wordLine = 1;
	let wordColumn = 1;
	for (let i = 0; i < text.length && errors.length < maxErrors; i++) {
		const c = text.charCodeAt(i);
		if (c === 10) {
			line++;
			lineStart = i + 1;
			continue;
		}
		if (c === 13 || c === 32 || c === 9) continue;
		if (c === 37 /* % */) {
			inExtended = !inExtended;
			blockFirst = true;
			wordStart = -1;
			continue;
		}
		if (c === 42 /* * */) {
			if (wordStart >= 0) {
				const word = text.slice(wordStart, i).replace(/[\r\n]/g, '');
				if (inExtended) extendedWord(wordLine, word);
				else if (!word.startsWith('G04')) coordinates(wordLine, wordColumn, word);
			}
			wordStart = -1;
			continue;
		}
		if (wordStart < 0) {
			wordStart = i;
			wordLine = line;
			wordColumn = i - lineStart + 1;
		} else if (i - wordStart >= limits.maxGerberWordChars) {
			over(
				wordLine,
				'command',
				`a command runs past ${formatCount(limits.maxGerberWordChars)} characters without ` +
					'its closing "*"; the file is not a Gerber layer or is damaged'
			);
			break;
		}
	}
	return { errors, maxStepRepeatCopies: maxCopies };
}
