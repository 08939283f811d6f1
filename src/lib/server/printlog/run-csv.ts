import { writeCsv, type CsvCell } from '$lib/csv/write-csv';
import type { RunView } from './run-view';

/** Columns of the run CSV export, in order. */
export const RUN_CSV_COLUMNS = [
	'id',
	'line',
	'product',
	'recipeVersion',
	'stencil',
	'stencilRevision',
	'pasteLot',
	'bladeCode',
	'boardSerial',
	'operator',
	'startedAt',
	'endedAt',
	'boardsPrinted',
	'ambientTempC',
	'relativeHumidityPct'
] as const;

/**
 * Runs as CSV through the one writer ($lib/csv/write-csv: RFC 4180, CRLF, formula-like text
 * escaped), one column per parameter, deviations and their reasons in the last columns. Numbers
 * unrounded; times ISO 8601 UTC.
 */
export function runsToCsv(runs: readonly RunView[], parameterKeys: readonly string[]): string {
	const header = [...RUN_CSV_COLUMNS, ...parameterKeys, 'deviations', 'warnings', 'corrections'];
	const rows: CsvCell[][] = runs.map((run) => [
		...RUN_CSV_COLUMNS.map((c) => run[c] as CsvCell),
		...parameterKeys.map((k) => run.parameters[k] as CsvCell),
		run.deviations
			.map((d) => `${d.parameter}=${d.value}${d.reason ? ` (${d.reason})` : ''}`)
			.join('; '),
		run.warnings.join('; '),
		run.corrections as CsvCell
	]);
	return writeCsv([header, ...rows]);
}
