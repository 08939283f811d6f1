import type { spcCharacteristics } from '../db/schema';

/**
 * The shapes the chart sources hand each other, in a module of their own so the print-log source
 * (chart-source.ts) and the SPI source (spi-source.ts) need not import each other.
 */

/** One subgroup of a characteristic's data, oldest first, with what the chart shows about it. */
export interface SourceSubgroup {
	/** Stable key: "run:12" (print log) or "board:88" (SPI); exclusions and signals use it. */
	key: string;
	label: string;
	boardId: number | null;
	boardIds: number[];
	at: Date | null;
	values: number[];
	/** Per-board aggregates instead of values (SPI, all pads): n, mean, sd, range. */
	stats?: { n: number; mean: number; sd: number; range: number };
}

export type CharacteristicRow = typeof spcCharacteristics.$inferSelect;
