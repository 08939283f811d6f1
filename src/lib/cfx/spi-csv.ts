/**
 * An inspected unit as a canonical SPI CSV (reference/ingest/canonical-layout.md), so CFX
 * measurements go through the same ingest, rules and signals as files (`ingestSpiFile`).
 */
import { CANONICAL_FIELDS } from '../ingest/canonical-fields';
import { PAD_MEASURE_KEYS } from '../spi/measures';
import type { InspectedUnit } from './map';

/** The canonical header (`CANONICAL_FIELDS`), in layout order: this CSV is read by the same parser. */
export const CANONICAL_SPI_HEADER = CANONICAL_FIELDS;

/** RFC 4180 text cell, always quoted: sender text is never read as a number or a formula. */
function quoted(value: string): string {
	return '"' + value.replace(/"/g, '""') + '"';
}

/**
 * A number in plain decimal notation with 2 decimals: the store keeps hundredths
 * (`encodeCentis`), so nothing finer survives anyway, and no exponent is ever written.
 */
export function centis(value: number): string {
	const fixed = value.toFixed(2);
	return fixed === '-0.00' ? '0.00' : fixed;
}

export interface SpiCsvContext {
	/** ISO time of the inspection (the envelope's TimeStamp). */
	inspectedAtMs: number;
	lineCode: string;
	productCode: string;
	stencilName: string | null;
	printRunId: number | null;
}

/**
 * The canonical CSV of the units of one UnitsInspected message. All units of one panel share the
 * serial and inspection time; `panel_index` is the unit's position number.
 * @example spiCsvForUnits([{ unitIdentifier: 'B1', positionNumber: 1, result: 'pass', pads: [...] }], ctx)
 */
export function spiCsvForUnits(units: readonly InspectedUnit[], ctx: SpiCsvContext): string {
	const at = new Date(ctx.inspectedAtMs).toISOString();
	const lines: string[] = [CANONICAL_SPI_HEADER.join(',')];
	for (const unit of units) {
		for (const p of unit.pads) {
			lines.push(
				[
					quoted(unit.unitIdentifier),
					at,
					quoted(ctx.lineCode),
					quoted(ctx.productCode),
					String(unit.positionNumber),
					quoted(p.refdes),
					quoted(p.pad),
					...PAD_MEASURE_KEYS.map((key) => centis(p[key])),
					p.result,
					p.volumeUm3 === null ? '' : String(p.volumeUm3),
					ctx.stencilName === null ? '' : quoted(ctx.stencilName),
					ctx.printRunId === null ? '' : `#${ctx.printRunId}`
				].join(',')
			);
		}
	}
	return lines.join('\r\n') + '\r\n';
}
