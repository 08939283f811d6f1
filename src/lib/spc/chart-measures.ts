import { NUMERIC_PARAMETER_KEYS, AMBIENT_PARAMETER_KEYS } from '../printlog/parameters';
import {
	SPI_MEASURE_IDS,
	SPI_MEASURES,
	type MeasureDefaults,
	type SpiMeasureId
} from '../spi/measures';

/** What a characteristic charts: the SPI measures of the catalogue, or a print parameter. */
export const MEASURES = [...SPI_MEASURE_IDS, 'print-parameter'] as unknown as readonly [
	SpiMeasureId | 'print-parameter',
	...(SpiMeasureId | 'print-parameter')[]
];
export type Measure = (typeof MEASURES)[number];

/** Print parameters a characteristic may chart (numeric keys of print_runs.parameters). */
export const CHARTABLE_PARAMETERS: readonly string[] = [
	...NUMERIC_PARAMETER_KEYS,
	...AMBIENT_PARAMETER_KEYS
];

export type { MeasureDefaults };

/**
 * Defaults per measure, offered when a characteristic is created (editable): the catalogue's
 * (`$lib/spi/measures`, where the numbers are argued), and none for a print parameter.
 */
export const MEASURE_DEFAULTS = {
	...Object.fromEntries(
		SPI_MEASURES.map((m): [SpiMeasureId, MeasureDefaults] => [
			m.id,
			{ label: m.label, unit: m.unit, ...m.defaults }
		])
	),
	'print-parameter': {
		label: 'Print parameter',
		unit: '',
		lsl: null,
		target: null,
		usl: null,
		source: 'the recipe window of the parameter'
	}
} as Record<Measure, MeasureDefaults>;

/** Unit of a print parameter from its key suffix (squeegeeSpeedMmS → mm/s). */
export function parameterUnit(key: string): string {
	const suffixes: [RegExp, string][] = [
		[/MmS$/, 'mm/s'],
		[/Mm$/, 'mm'],
		[/Kg$/, 'kg'],
		[/Deg$/, '°'],
		[/TempC$/, '°C'],
		[/Pct$/, '%'],
		[/Prints$/, 'prints']
	];
	return suffixes.find(([re]) => re.test(key))?.[1] ?? '';
}

/** Whether a measure comes from SPI data (else from the print log). */
export const isSpiMeasure = (m: string) => m !== 'print-parameter';
