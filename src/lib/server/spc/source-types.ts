import type { spcCharacteristics } from '../db/schema';

/**
 * The stored characteristic row, in a module of its own so the print-log source (chart-source.ts)
 * and the SPI source (spi-source.ts) need not import each other. The subgroup shape they hand
 * on is the pure one of `$lib/spc`.
 */
export type { SourceSubgroup } from '$lib/spc';

export type CharacteristicRow = typeof spcCharacteristics.$inferSelect;
