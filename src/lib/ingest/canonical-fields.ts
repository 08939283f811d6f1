/**
 * The canonical Rollbead SPI layout: one row per pad deposit. Every other export is mapped onto
 * these field names by a mapping profile. See `reference/ingest/canonical-layout.md`.
 */

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
 * Inclusive plausibility ranges checked on every row, after unit conversion. They are wide on
 * purpose: a value outside them is a mapping or unit mistake, not a bad print.
 * Why these numbers: SPI reports volume/area/height as % of the aperture's nominal value, and
 * 100 % is the target with 50–150 % specs (REFERENCE-FACTS §e), so 10× nominal is never real;
 * stencil foils are 75–200 µm (common practice), so 2000 µm of height is impossible; an offset
 * of 5 mm is larger than any SMT pad. Rollbead's own choices, not from a standard.
 */
export const FIELD_RANGES = {
	volume_pct: { min: 0, max: 1000 },
	area_pct: { min: 0, max: 1000 },
	height_um: { min: 0, max: 2000 },
	offset_x_um: { min: -5000, max: 5000 },
	offset_y_um: { min: -5000, max: 5000 },
	volume_um3: { min: 0, max: 1e12 },
	panel_index: { min: 0, max: 65535 }
} as const;

/** Longest accepted text value (serial, refdes, pad, line, product, stencil, print run). */
export const MAX_TEXT_LENGTH = 100;
