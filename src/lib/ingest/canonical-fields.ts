/**
 * The canonical Rollbead SPI layout: one row per pad deposit. Every other export is mapped onto
 * these field names by a mapping profile. See `reference/ingest/canonical-layout.md`.
 */
import { PAD_MEASURE_RANGES } from '../spi/measures';

/** Canonical columns that every file must supply (directly or through the profile). */
export const REQUIRED_FIELDS = [
	'board_serial',
	'inspected_at',
	'line',
	'product',
	'panel_index',
	'refdes',
	'pad',
	'volume_pct',
	'area_pct',
	'height_um',
	'offset_x_um',
	'offset_y_um',
	'result'
] as const;

/** Canonical columns that may be present; absent ones are stored as null. */
export const OPTIONAL_FIELDS = ['volume_um3', 'stencil', 'print_run'] as const;

/** All canonical columns, required first, in the order of the canonical header. */
export const CANONICAL_FIELDS = [...REQUIRED_FIELDS, ...OPTIONAL_FIELDS] as const;

/** One canonical column name, e.g. `'volume_pct'`. */
export type CanonicalField = (typeof CANONICAL_FIELDS)[number];

/**
 * Whether a text is a canonical field name (exact, already trimmed and lower-cased).
 * @example isCanonicalField('refdes') // true
 */
export function isCanonicalField(name: string): name is CanonicalField {
	return (CANONICAL_FIELDS as readonly string[]).includes(name);
}

/**
 * Inclusive plausibility ranges checked on every row, after unit conversion: the pad measures'
 * from the measure catalogue (`$lib/spi/measures`, where the numbers are argued), plus absolute
 * volume (10¹² µm³ is 1 cm³, far past any deposit) and the panel index (16 bits).
 */
export const FIELD_RANGES = {
	...PAD_MEASURE_RANGES,
	volume_um3: { min: 0, max: 1e12 },
	panel_index: { min: 0, max: 65535 }
} as const;

/** Longest accepted text value (serial, refdes, pad, line, product, stencil, print run). */
export const MAX_TEXT_LENGTH = 100;
