/**
 * The one catalogue of SPI measures: how a file names each measure, how it is stored, shown and
 * charted, its plausibility range and its default spec limits. The parser, the board aggregates,
 * the chart measures, the CFX mapping, exports and screens all derive their lists from here.
 * Client-safe (no server, framework or database imports).
 */

/** Default spec limits offered when a chart is created (editable), with where they come from. */
export interface MeasureDefaults {
	label: string;
	unit: string;
	lsl: number | null;
	target: number | null;
	usl: number | null;
	/** Where the default comes from. */
	source: string;
}

/** One SPI measure. */
export interface SpiMeasureSpec {
	/** Chart measure id (characteristics, API): `volume-pct`. */
	id: string;
	/** Key in parsed rows and board aggregates; camel-case of `column`: `volumePct`. */
	key: string;
	/** Canonical file column, or null for a measure derived on import (transfer efficiency). */
	field: string | null;
	/** SQL prefix of the per-board aggregate columns of spi_boards: `volume_pct` → `volume_pct_mean`. */
	column: string;
	/** Pad measurement column (hundredths), or null when pads do not store it. */
	padColumn: string | null;
	/** Name on screens and charts: `Paste volume`. */
	label: string;
	/** Name in tables where the context says "paste": `Volume`. */
	shortLabel: string;
	/** Canonical unit: `%` or `µm`. */
	unit: string;
	/** Decimals kept and shown: pads store hundredths of the canonical unit. */
	decimals: number;
	/** Factor from the stored board figures to the charted unit (1, or 100 for a fraction). */
	chartScale: number;
	/**
	 * Inclusive plausibility range of a pad value after unit conversion (null for derived
	 * measures). Wide on purpose: a value outside is a mapping or unit mistake, not a bad print.
	 */
	range: { min: number; max: number } | null;
	/** Default spec limits of a chart of this measure. */
	defaults: Omit<MeasureDefaults, 'label' | 'unit'>;
}

/**
 * The SPI measures in the order of the canonical layout (reference/ingest/canonical-layout.md),
 * then the derived transfer efficiency.
 *
 * Ranges: SPI reports volume/area/height as % of the aperture's nominal value, and 100 % is the
 * target with 50–150 % specs (REFERENCE-FACTS §e), so 10× nominal is never real; stencil foils
 * are 75–200 µm (common practice), so 2000 µm of height is impossible; an offset of 5 mm is
 * larger than any SMT pad. Rollbead's own choices, not from a standard.
 *
 * Default limits: volume and transfer efficiency 50–150 % with target 100 %: REFERENCE-FACTS
 * "SPI acceptance windows" (confirmed, trade practice). Area 50–150 %: common practice, mirrors
 * volume. Offsets: target 0 without default limits (they depend on pad size). Height: no default
 * (it depends on the stencil thickness).
 */
export const SPI_MEASURES = [
	{
		id: 'volume-pct',
		key: 'volumePct',
		field: 'volume_pct',
		column: 'volume_pct',
		padColumn: 'volume_centi_pct',
		label: 'Paste volume',
		shortLabel: 'Volume',
		unit: '%',
		decimals: 2,
		chartScale: 1,
		range: { min: 0, max: 1000 },
		defaults: {
			lsl: 50,
			target: 100,
			usl: 150,
			source: 'trade practice for SPI acceptance windows (50–150 %)'
		}
	},
	{
		id: 'area-pct',
		key: 'areaPct',
		field: 'area_pct',
		column: 'area_pct',
		padColumn: 'area_centi_pct',
		label: 'Paste area',
		shortLabel: 'Area',
		unit: '%',
		decimals: 2,
		chartScale: 1,
		range: { min: 0, max: 1000 },
		defaults: {
			lsl: 50,
			target: 100,
			usl: 150,
			source: 'common practice (mirrors the volume window)'
		}
	},
	{
		id: 'height-um',
		key: 'heightUm',
		field: 'height_um',
		column: 'height_um',
		padColumn: 'height_centi_um',
		label: 'Paste height',
		shortLabel: 'Height',
		unit: 'µm',
		decimals: 2,
		chartScale: 1,
		range: { min: 0, max: 2000 },
		defaults: {
			lsl: null,
			target: null,
			usl: null,
			source: 'depends on the stencil thickness; set per product'
		}
	},
	{
		id: 'offset-x-um',
		key: 'offsetXUm',
		field: 'offset_x_um',
		column: 'offset_x_um',
		padColumn: 'offset_x_centi_um',
		label: 'Offset X',
		shortLabel: 'Offset X',
		unit: 'µm',
		decimals: 2,
		chartScale: 1,
		range: { min: -5000, max: 5000 },
		defaults: { lsl: null, target: 0, usl: null, source: 'target 0; limits depend on pad size' }
	},
	{
		id: 'offset-y-um',
		key: 'offsetYUm',
		field: 'offset_y_um',
		column: 'offset_y_um',
		padColumn: 'offset_y_centi_um',
		label: 'Offset Y',
		shortLabel: 'Offset Y',
		unit: 'µm',
		decimals: 2,
		chartScale: 1,
		range: { min: -5000, max: 5000 },
		defaults: { lsl: null, target: 0, usl: null, source: 'target 0; limits depend on pad size' }
	},
	{
		// Deposit volume (µm³) ÷ aperture volume, per pad, when the file has µm³ and the stencil
		// is known. Stored per board as a fraction; charted in % (× 100).
		id: 'transfer-efficiency-pct',
		key: 'te',
		field: null,
		column: 'te',
		padColumn: null,
		label: 'Transfer efficiency',
		shortLabel: 'Transfer efficiency',
		unit: '%',
		decimals: 1,
		chartScale: 100,
		range: null,
		defaults: {
			lsl: 50,
			target: 100,
			usl: 150,
			source: 'trade practice (transfer efficiency = deposit volume as % of aperture volume)'
		}
	}
] as const satisfies readonly SpiMeasureSpec[];

/** One catalogue entry. */
export type SpiMeasure = (typeof SPI_MEASURES)[number];
/** Chart measure id of an SPI measure: `volume-pct` … `transfer-efficiency-pct`. */
export type SpiMeasureId = SpiMeasure['id'];

/** The measures every pad row carries (read from files, stored per pad, aggregated per board). */
export type PadMeasure = Extract<SpiMeasure, { field: string }>;
export const PAD_MEASURES = SPI_MEASURES.filter((m): m is PadMeasure => m.field !== null);
/** Row / aggregate key of a pad measure: `volumePct` … `offsetYUm`. */
export type PadMeasureKey = PadMeasure['key'];
/** Canonical file column of a pad measure: `volume_pct` … `offset_y_um`. */
export type PadMeasureField = PadMeasure['field'];

/** Keys of the pad measures, in catalogue order. */
export const PAD_MEASURE_KEYS: readonly PadMeasureKey[] = PAD_MEASURES.map((m) => m.key);

/** Chart measure ids of the SPI measures, in catalogue order. */
export const SPI_MEASURE_IDS = SPI_MEASURES.map((m) => m.id) as readonly SpiMeasureId[];

/**
 * Catalogue entries by chart measure id.
 * @example SPI_MEASURE_BY_ID['volume-pct'].defaults.target // 100
 */
export const SPI_MEASURE_BY_ID = Object.fromEntries(SPI_MEASURES.map((m) => [m.id, m])) as {
	[I in SpiMeasureId]: Extract<SpiMeasure, { id: I }>;
};

/**
 * The catalogue entry of a chart measure id, or undefined (e.g. `print-parameter`).
 * @example spiMeasureById('height-um')?.unit // 'µm'
 */
export function spiMeasureById(id: string): SpiMeasure | undefined {
	return SPI_MEASURES.find((m) => m.id === id);
}

/**
 * Plausibility ranges by canonical file field, for the parser.
 * @example PAD_MEASURE_RANGES.height_um // { min: 0, max: 2000 }
 */
export const PAD_MEASURE_RANGES = Object.fromEntries(
	PAD_MEASURES.map((m) => [m.field, m.range])
) as { [F in PadMeasureField]: { readonly min: number; readonly max: number } };
