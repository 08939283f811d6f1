/** One Pareto row with its bar length and cumulative share. */
export type ParetoRow<T> = T & { barPct: number; cumulativePct: number };

/**
 * Bars and the cumulative percentage of a Pareto table. The cumulative share is of ALL failures
 * (`totalFails`), not only of the rows shown, so a top-20 list of 1,000 failures does not reach
 * 100 % at its last row (Juran's Pareto line: running total ÷ grand total). Bar length is
 * relative to the largest row.
 * @example paretoRows([{ fails: 6 }, { fails: 3 }], 10).map((r) => r.cumulativePct) // [60, 90]
 */
export function paretoRows<T extends { fails: number }>(
	rows: readonly T[],
	totalFails: number
): ParetoRow<T>[] {
	const total = Math.max(
		totalFails,
		rows.reduce((s, r) => s + r.fails, 0)
	);
	const largest = rows.reduce((m, r) => Math.max(m, r.fails), 0);
	let running = 0;
	return rows.map((r) => {
		running += r.fails;
		return {
			...r,
			barPct: largest ? (r.fails / largest) * 100 : 0,
			cumulativePct: total ? (running / total) * 100 : 0
		};
	});
}
