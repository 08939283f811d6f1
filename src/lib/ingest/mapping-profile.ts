import type { CanonicalField } from './canonical-fields';

/** Delimiter setting of a profile; `'auto'` detects comma, semicolon or tab from the header. */
export type DelimiterSetting = 'auto' | ',' | ';' | '\t';

/** How the mapped volume column is expressed. */
export type VolumeMode = 'percent' | 'absolute-um3' | 'absolute-mil3';

/** Row-error policy: reject the whole file, or skip bad rows and import the rest. */
export type BadRowPolicy = 'reject-file' | 'skip-row';

/**
 * How to read one kind of SPI export into the canonical layout. Stored per machine/layout and
 * chosen on upload. Validated by `mappingProfileSchema` in `$lib/schemas/ingest`.
 *
 * - `columns`: source header per canonical field (case-insensitive, trimmed). A field without an
 *   entry is looked up under its canonical name.
 * - `lengthUnit`: unit of height and offsets in the file; converted to µm.
 * - `volumeMode`: `'percent'` reads `volume_pct`; the absolute modes read `volume_um3` (in µm³ or
 *   mil³) and make `volume_pct` optional (NaN when absent, computed later from the aperture).
 * - `timestampFormat`: `'iso'` or a pattern (see `compileTimestampPattern`).
 * - `timeZone`: IANA zone for timestamps without an offset.
 * - `resultWords`: words meaning pass / warn / fail, compared case-insensitively.
 * - `serialFromFileName`: take the board serial from the file name (regex, one capture group)
 *   instead of a column (one-file-per-board exports).
 * - `constants`: values for exports that do not carry them (line, product, panel index).
 */
export interface MappingProfile {
	name: string;
	machine: string;
	delimiter: DelimiterSetting;
	decimalComma: boolean;
	columns: Partial<Record<CanonicalField, string>>;
	lengthUnit: 'um' | 'mm' | 'mil';
	volumeMode: VolumeMode;
	timestampFormat: string;
	timeZone: string;
	resultWords: { pass: string[]; warn: string[]; fail: string[] };
	serialFromFileName?: { pattern: string };
	constants?: { line?: string; product?: string; panelIndex?: number };
	onBadRow: BadRowPolicy;
}

/**
 * The profile for Rollbead's own canonical layout (`reference/ingest/canonical-layout.md`):
 * auto delimiter, decimal point, µm, volume in %, ISO timestamps (UTC when no offset),
 * results pass / warn / fail, whole file rejected on any bad row.
 * @example CANONICAL_PROFILE.timeZone // 'UTC'
 */
export const CANONICAL_PROFILE: MappingProfile = Object.freeze({
	name: 'Rollbead canonical',
	machine: 'any',
	delimiter: 'auto',
	decimalComma: false,
	columns: {},
	lengthUnit: 'um',
	volumeMode: 'percent',
	timestampFormat: 'iso',
	timeZone: 'UTC',
	resultWords: { pass: ['pass'], warn: ['warn'], fail: ['fail'] },
	onBadRow: 'reject-file'
}) as MappingProfile;
