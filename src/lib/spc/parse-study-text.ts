/**
 * Parse pasted or uploaded columns of numbers for the ad-hoc study: one subgroup per line,
 * values separated by commas, semicolons, tabs or spaces. A first line with words is taken as a
 * header and skipped; blank lines are ignored. Decimal commas are not accepted when the comma is
 * also the separator, so "1,5" is two values (say so in the page hint).
 */

/** One problem in the pasted text, in the shared `{ field, message }` shape. */
export interface StudyTextError {
	field: string;
	message: string;
}

/** Rows of numbers (each row a subgroup) or the problems found, by line and column. */
export type StudyTextResult =
	| { ok: true; rows: number[][]; lineOf: number[]; headerSkipped: boolean }
	| { ok: false; errors: StudyTextError[] };

const NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

/**
 * Split study text into rows of finite numbers.
 * @example parseStudyText('1 2\n3 4') // rows [[1, 2], [3, 4]], lineOf [1, 2]
 */
export function parseStudyText(text: string, maxErrors = 20): StudyTextResult {
	const rows: number[][] = [];
	const lineOf: number[] = [];
	const errors: StudyTextError[] = [];
	let headerSkipped = false;
	const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
	for (let i = 0; i < lines.length; i++) {
		const line = lines[i].trim();
		if (!line) continue;
		const cells = line.split(/[,;\t ]+/).filter((c) => c !== '');
		const numbers: number[] = [];
		const bad: number[] = [];
		cells.forEach((cell, c) => {
			if (NUMBER.test(cell) && Number.isFinite(Number(cell))) numbers.push(Number(cell));
			else bad.push(c);
		});
		if (bad.length && rows.length === 0 && !headerSkipped && bad.length === cells.length) {
			headerSkipped = true; // a header line of column names
			continue;
		}
		for (const c of bad) {
			if (errors.length < maxErrors) {
				errors.push({
					field: `data`,
					message: `line ${i + 1}, column ${c + 1}: "${cells[c].slice(0, 30)}" is not a number`
				});
			}
		}
		rows.push(numbers);
		lineOf.push(i + 1);
	}
	if (errors.length) return { ok: false, errors };
	if (rows.length === 0) {
		return {
			ok: false,
			errors: [{ field: 'data', message: 'no numbers found; paste at least two rows' }]
		};
	}
	return { ok: true, rows, lineOf, headerSkipped };
}
