/**
 * Checks on the raw text of an uploaded Gerber file before it is parsed, so binary uploads,
 * empty files and oversized files fail fast with a message that says where.
 */
import { gerberProblem, type GerberProblem } from './gerber-message';

/** Line and column (both 1-based) of a character index. */
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

const mebibytes = (n: number) => (n / 1024 / 1024).toFixed(1);

/**
 * Check that `text` is a plausible Gerber file: a string, at most `maxBytes` characters
 * (Gerber is ASCII, so characters = bytes), free of control characters other than tab, CR
 * and LF (and of U+FFFD, which decoding binary data as UTF-8 produces), not blank, and
 * containing at least one `*`-terminated command. Used first by the Gerber importer.
 * @returns the first problem found, or null.
 * @example checkGerberText('M48\nT1C0.3\n', 1e6)
 * // { line: 1, message: 'line 1, content: no "*"-terminated Gerber commands found; …' }
 */
export function checkGerberText(text: unknown, maxBytes: number): GerberProblem | null {
	if (typeof text !== 'string') {
		return gerberProblem(0, 'input', `must be text (got ${typeof text})`);
	}
	if (text.length > maxBytes) {
		const sizes = `${mebibytes(text.length)} MB is over the ${mebibytes(maxBytes)} MB limit`;
		return gerberProblem(0, 'size', `${sizes} for a paste layer`);
	}
	const bad = /[\u0000-\u0008\u000B\u000E-\u001F\u007F\uFFFD]/.exec(text);
	if (bad) {
		const { line, column } = lineOf(text, bad.index);
		const code = bad[0].charCodeAt(0).toString(16).toUpperCase().padStart(4, '0');
		const message = `binary data (U+${code}); this is not a text Gerber file`;
		return gerberProblem(line, `column ${column}`, message);
	}
	if (text.trim() === '') return gerberProblem(0, 'content', 'the file is empty');
	if (!text.includes('*')) {
		const message = 'no "*"-terminated Gerber commands found; this is not a Gerber file';
		return gerberProblem(1, 'content', message);
	}
	return null;
}
