import { NUMERIC_PARAMETER_KEYS, AMBIENT_PARAMETER_KEYS } from '$lib/printlog/parameters';

/** What a characteristic charts. */
export const MEASURES = [
	'volume-pct',
	'height-um',
	'area-pct',
	'offset-x-um',
	'offset-y-um',
	'transfer-efficiency-pct',
	'print-parameter'
] as const;
export type Measure = (typeof MEASURES)[number];

/** Print parameters a characteristic may chart (numeric keys of print_runs.parameters). */
export const CHARTABLE_PARAMETERS: readonly string[] = [
	...NUMERIC_PARAMETER_KEYS,
	...AMBIENT_PARAMETER_KEYS
];

/** Label, unit and default specs of each measure. */
export interface MeasureDefaults {
	label: string;
	unit: string;
	lsl: number | null;
	target: number | null;
	usl: number | null;
	/** Where the default comes from. */
	source: string;
}

/**
 * Sensible defaults per measure, offered when a characteristic is created (editable).
 * Volume and transfer efficiency 50–150 % with target 100 %: REFERENCE-FACTS "SPI acceptance
 * windows" (confirmed, trade practice). Area 50–150 %: common practice, mirrors volume. Offsets:
 * target 0 without default limits (they depend on pad size). Height: no default (it depends on
 * the stencil thickness).
 */
export const MEASURE_DEFAULTS: Record<Measure, MeasureDefaults> = {
	'volume-pct': {
		label: 'Paste volume',
		unit: '%',
		lsl: 50,
		target: 100,
		usl: 150,
		source: 'trade practice for SPI acceptance windows (50–150 %)'
	},
	'height-um': {
		label: 'Paste height',
		unit: 'µm',
		lsl: null,
		target: null,
		usl: null,
		source: 'depends on the stencil thickness; set per product'
	},
	'area-pct': {
		label: 'Paste area',
		unit: '%',
		lsl: 50,
		target: 100,
		usl: 150,
		source: 'common practice (mirrors the volume window)'
	},
	'offset-x-um': {
		label: 'Offset X',
		unit: 'µm',
		lsl: null,
		target: 0,
		usl: null,
		source: 'target 0; limits depend on pad size'
	},
	'offset-y-um': {
		label: 'Offset Y',
		unit: 'µm',
		lsl: null,
		target: 0,
		usl: null,
		source: 'target 0; limits depend on pad size'
	},
	'transfer-efficiency-pct': {
		label: 'Transfer efficiency',
		unit: '%',
		lsl: 50,
		target: 100,
		usl: 150,
		source: 'trade practice (transfer efficiency = deposit volume as % of aperture volume)'
	},
	'print-parameter': {
		label: 'Print parameter',
		unit: '',
		lsl: null,
		target: null,
		usl: null,
		source: 'the recipe window of the parameter'
	}
};

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
