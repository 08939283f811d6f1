/**
 * Budgets of one SPI file, counted before the work they bound: a hostile or broken file is
 * refused with a message naming the line, instead of filling memory. A site whose exports need
 * more raises them through the environment (`spiParseLimitsFromEnv`, read by the server).
 */

/** Limits of one parse. */
export interface SpiParseLimits {
	/** Longest physical line in bytes (a file without line feeds is refused at this size). */
	maxLineBytes: number;
	/** Most columns in the header line. */
	maxColumns: number;
	/** Most board inspections in one file (each is held in memory until the end of the file). */
	maxBoards: number;
}

/**
 * Defaults: a pad row is ~100 bytes and a header of a real export a few kB, so 1 MiB per line is
 * 10,000× a row; exports carry tens of columns; a day of one line is a few thousand boards. A
 * board inspection costs ~1.4 kB while the file is read and ~2.5 kB with its summary (measured
 * with one-pad boards), so 50,000 boards stay near 130 MB.
 */
export const DEFAULT_SPI_PARSE_LIMITS: Readonly<SpiParseLimits> = Object.freeze({
	maxLineBytes: 1024 * 1024,
	maxColumns: 1000,
	maxBoards: 50_000
});

/** The environment variable that raises or lowers each limit. */
export const SPI_PARSE_LIMIT_ENV: Readonly<Record<keyof SpiParseLimits, string>> = Object.freeze({
	maxLineBytes: 'SPI_MAX_LINE_BYTES',
	maxColumns: 'SPI_MAX_COLUMNS',
	maxBoards: 'SPI_MAX_BOARDS_PER_FILE'
});

/**
 * Limits from environment variables (`SPI_MAX_LINE_BYTES`, `SPI_MAX_COLUMNS`,
 * `SPI_MAX_BOARDS_PER_FILE`), each a positive integer of plain digits; unset ones keep the
 * default. Problems come back as messages (the caller logs them) and leave the default in place.
 * @example spiParseLimitsFromEnv({ SPI_MAX_COLUMNS: '2000' }).limits.maxColumns // 2000
 * @example spiParseLimitsFromEnv({ SPI_MAX_COLUMNS: '2e3' }).problems // ['SPI_MAX_COLUMNS=...']
 */
export function spiParseLimitsFromEnv(env: Record<string, string | undefined>): {
	limits: SpiParseLimits;
	problems: string[];
} {
	const limits: SpiParseLimits = { ...DEFAULT_SPI_PARSE_LIMITS };
	const problems: string[] = [];
	for (const key of Object.keys(SPI_PARSE_LIMIT_ENV) as (keyof SpiParseLimits)[]) {
		const name = SPI_PARSE_LIMIT_ENV[key];
		const raw = env[name];
		if (raw === undefined || raw.trim() === '') continue;
		const value = /^[0-9]{1,15}$/.test(raw.trim()) ? Number(raw.trim()) : NaN;
		if (!(value >= 1)) {
			problems.push(
				`${name}=${JSON.stringify(raw)} is not a positive whole number; using ${limits[key]}`
			);
		} else {
			limits[key] = value;
		}
	}
	return { limits, problems };
}

/**
 * A byte count as people read it: `1 MiB`, `64 KiB`, `1500 bytes`.
 * @example formatByteLimit(1048576) // '1 MiB'
 */
export function formatByteLimit(bytes: number): string {
	if (bytes >= 1024 * 1024 && bytes % (1024 * 1024) === 0) return `${bytes / 1024 / 1024} MiB`;
	if (bytes >= 1024 && bytes % 1024 === 0) return `${bytes / 1024} KiB`;
	return `${bytes} bytes`;
}
