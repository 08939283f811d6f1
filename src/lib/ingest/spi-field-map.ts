/**
 * Field mapping of the SPI parser: which column of a file holds each canonical field, and which
 * fields the profile supplies otherwise (serial from the file name, constants for line, product
 * and panel index).
 */
import { MAX_TEXT_LENGTH } from './canonical-fields';
import type { MappingProfile } from './mapping-profile';
import { resolveHeader, type ResolvedHeader } from './resolve-header';
import { compileSerialPattern, serialFromText } from './serial-pattern';

/**
 * Column index of each value a row is read from; -1 when the file has no such column or the
 * profile supplies the value (serial from the file name, a constant).
 */
export interface SpiColumns {
	serial: number;
	time: number;
	line: number;
	product: number;
	panel: number;
	refdes: number;
	pad: number;
	volumePct: number;
	areaPct: number;
	heightUm: number;
	offsetXUm: number;
	offsetYUm: number;
	result: number;
	volumeUm3: number;
	stencil: number;
	printRun: number;
}

/** The header of a file mapped through a profile. */
export interface SpiFieldMap {
	header: ResolvedHeader;
	columns: SpiColumns;
}

/**
 * Map a header (names as split from the file) through `profile`. Missing and duplicated columns
 * come back in `header.errors`, unused ones in `header.warnings`.
 * @example mapSpiHeader(['board_serial', 'refdes'], CANONICAL_PROFILE, false).columns.refdes // 1
 */
export function mapSpiHeader(
	names: string[],
	profile: MappingProfile,
	serialFromFileName: boolean
): SpiFieldMap {
	const header = resolveHeader(names, profile);
	const ix = header.indices;
	const constants = profile.constants;
	return {
		header,
		columns: {
			serial: serialFromFileName ? -1 : ix.board_serial,
			time: ix.inspected_at,
			line: constants?.line === undefined ? ix.line : -1,
			product: constants?.product === undefined ? ix.product : -1,
			panel: constants?.panelIndex === undefined ? ix.panel_index : -1,
			refdes: ix.refdes,
			pad: ix.pad,
			volumePct: ix.volume_pct,
			areaPct: ix.area_pct,
			heightUm: ix.height_um,
			offsetXUm: ix.offset_x_um,
			offsetYUm: ix.offset_y_um,
			result: ix.result,
			volumeUm3: ix.volume_um3,
			stencil: ix.stencil,
			printRun: ix.print_run
		}
	};
}

function baseName(fileName: string): string {
	const cut = Math.max(fileName.lastIndexOf('/'), fileName.lastIndexOf('\\'));
	return fileName.slice(cut + 1);
}

/**
 * The board serial a profile takes from the file name (`serialFromFileName`): `{ serial: null,
 * error: null }` when the profile reads it from a column, else the serial or a file-level error.
 * @example serialFromFileName({ ...CANONICAL_PROFILE, serialFromFileName: { pattern: '^(RB-\\d+)' } }, 'x/RB-7.csv').serial // 'RB-7'
 */
export function serialFromFileName(
	profile: MappingProfile,
	fileName: string
): { serial: string | null; error: string | null } {
	if (!profile.serialFromFileName) return { serial: null, error: null };
	const name = baseName(fileName);
	const pattern = profile.serialFromFileName.pattern;
	// RE2: linear-time matching whatever the user typed (see serial-pattern.ts).
	const compiled = compileSerialPattern(pattern);
	if (!compiled.ok) {
		return { serial: null, error: `the profile's ${compiled.reason}; edit the mapping profile` };
	}
	const serial = serialFromText(compiled.regex, name);
	if (serial === null) {
		return {
			serial: null,
			error: `file name "${name}" does not match the serial pattern /${pattern}/`
		};
	}
	if (serial.length > MAX_TEXT_LENGTH) {
		return {
			serial: null,
			error: `board_serial from the file name is longer than ${MAX_TEXT_LENGTH} characters`
		};
	}
	return { serial, error: null };
}
