import { CANONICAL_FIELDS, type CanonicalField } from './canonical-fields';
import type { IngestIssue } from './ingest-issue';
import type { MappingProfile } from './mapping-profile';

/** Where each canonical field sits in the file, plus header problems. */
export interface ResolvedHeader {
	/** Column index per canonical field, -1 when the file has no such column. */
	indices: Record<CanonicalField, number>;
	/** Header names as written (trimmed), used in error messages. */
	names: string[];
	/** Missing or duplicated required columns (all on row 1). */
	errors: IngestIssue[];
	/** Columns no field uses (ignored), on row 1. */
	warnings: IngestIssue[];
}

/**
 * Canonical fields a file must carry under `profile`: all of `REQUIRED_FIELDS`, except those the
 * profile supplies otherwise (serial from the file name, constants for line / product / panel
 * index), with `volume_um3` instead of `volume_pct` in the absolute volume modes.
 * @example requiredFieldsFor(CANONICAL_PROFILE).length // 13
 */
export function requiredFieldsFor(profile: MappingProfile): CanonicalField[] {
	return CANONICAL_FIELDS.filter((field) => {
		switch (field) {
			case 'board_serial':
				return !profile.serialFromFileName;
			case 'line':
				return profile.constants?.line === undefined;
			case 'product':
				return profile.constants?.product === undefined;
			case 'panel_index':
				return profile.constants?.panelIndex === undefined;
			case 'volume_pct':
				return profile.volumeMode === 'percent';
			case 'volume_um3':
				return profile.volumeMode !== 'percent';
			case 'stencil':
			case 'print_run':
				return false;
			default:
				return true;
		}
	});
}

const normaliseName = (name: string) => name.trim().toLowerCase();

/**
 * Match a file's header fields to canonical fields through the profile's `columns` (a field
 * without an entry is looked up under its own name). Names compare trimmed and
 * case-insensitively. A missing required column gives one error per column, naming it; a
 * required column found twice is an error; unused columns give warnings.
 * Used once per file, on its first non-blank line.
 * @example resolveHeader(['refdes'], CANONICAL_PROFILE).errors.length // 12 (the other required columns)
 */
export function resolveHeader(
	headerFields: readonly string[],
	profile: MappingProfile
): ResolvedHeader {
	const names = headerFields.map((h) => h.trim());
	const lower = names.map(normaliseName);
	const required = new Set(requiredFieldsFor(profile));
	const indices = {} as Record<CanonicalField, number>;
	const errors: IngestIssue[] = [];
	const used = new Set<number>();
	for (const field of CANONICAL_FIELDS) {
		const source = normaliseName(profile.columns[field] ?? field);
		const index = lower.indexOf(source);
		indices[field] = index;
		if (index < 0) {
			if (required.has(field)) {
				const mapped = profile.columns[field];
				errors.push({
					row: 1,
					column: mapped ?? field,
					message: mapped
						? `required column "${mapped}" (for ${field}) is missing`
						: `required column "${field}" is missing`
				});
			}
			continue;
		}
		used.add(index);
		if (lower.indexOf(source, index + 1) >= 0) {
			errors.push({
				row: 1,
				column: names[index],
				message: `column "${names[index]}" appears more than once`
			});
		}
	}
	const warnings: IngestIssue[] = [];
	names.forEach((name, i) => {
		if (used.has(i)) return;
		warnings.push({
			row: 1,
			column: name,
			message:
				name === '' ? `column ${i + 1} has no name; ignored` : `unknown column "${name}" ignored`
		});
	});
	return { indices, names, errors, warnings };
}
