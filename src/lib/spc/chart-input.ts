/**
 * What a stored characteristic's chart is computed from, as plain data: the loaders in
 * `$lib/server/spc` fill these shapes from the database, the functions here and in
 * `chart-detail.ts` compute from them.
 */

/** Per-board aggregates of one measure (SPI, all pads): the pad values themselves are not read. */
export interface BoardStats {
	n: number;
	mean: number;
	sd: number;
	range: number;
	/** Smallest and largest pad value, when stored (they decide which boards hold pads out of spec). */
	min?: number | null;
	max?: number | null;
}

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
	stats?: BoardStats;
}

/** The fields of a characteristic the computation reads (a stored row has them all). */
export interface ChartCharacteristic {
	name: string;
	productCode: string;
	measure: string;
	parameterKey: string | null;
	chartKind: string;
	subgroupMode: string;
	subgroupSize: number;
	lsl: number | null;
	target: number | null;
	usl: number | null;
	unit: string;
	rules: string[];
}

/** Values per plotted point: n for consecutive subgroups, else 1 (print log) or the pads. */
export const valuesPerPoint = (c: Pick<ChartCharacteristic, 'subgroupMode' | 'subgroupSize'>) =>
	c.subgroupMode === 'consecutive' ? Math.max(1, c.subgroupSize) : 1;

/** The stored print-log fields one print parameter is read from. */
export interface PrintRunValues {
	parameters: Record<string, unknown>;
	ambientTempC: number | null;
	relativeHumidityPct: number | null;
}

/**
 * One print parameter of a run as a finite number, or null when it is missing or not a number.
 * Ambient temperature and humidity live in their own columns; a logged value wins.
 * @example printParameterValue({ parameters: { squeegeeSpeedMmS: '40' }, ambientTempC: null, relativeHumidityPct: null }, 'squeegeeSpeedMmS') // 40
 */
export function printParameterValue(run: PrintRunValues, key: string): number | null {
	const raw =
		run.parameters?.[key] ??
		(key === 'ambientTempC'
			? run.ambientTempC
			: key === 'relativeHumidityPct'
				? run.relativeHumidityPct
				: null);
	const v =
		typeof raw === 'number' ? raw : typeof raw === 'string' && raw.trim() ? Number(raw) : NaN;
	return Number.isFinite(v) ? v : null;
}

/** One print run's value of the charted parameter, oldest first. */
export interface RunValue {
	id: number;
	startedAt: Date;
	lineCode: string;
	value: number;
	/** A point that is not a print run (a board a printer reported over CFX): its key and label. */
	point?: { key: string; label: string };
}

/**
 * Print-log subgroups: one value per run, `perPoint` runs at a time (an incomplete newest group
 * waits), the newest `limit` groups.
 * @example groupRuns(runs, 1, 200)[0].key // 'run:12'
 */
export function groupRuns(runs: readonly RunValue[], perPoint: number, limit: number) {
	const out: SourceSubgroup[] = [];
	const full = runs.length - (runs.length % perPoint);
	for (let i = 0; i < full; i += perPoint) {
		const group = runs.slice(i, i + perPoint);
		const first = group[0];
		const last = group[group.length - 1];
		out.push({
			key: first.point?.key ?? `run:${first.id}`,
			label:
				perPoint === 1
					? (first.point?.label ?? `run ${first.id}`) + ` · ${first.lineCode}`
					: `runs ${first.id}–${last.id} · ${first.lineCode}`,
			boardId: null,
			boardIds: [],
			at: last.startedAt,
			values: group.map((g) => g.value)
		});
	}
	return out.slice(-limit);
}

/** One inspected board's data of the charted measure: its pad values or its aggregates. */
export interface BoardValues {
	id: number;
	serial: string;
	at: Date;
	lineCode: string;
	values: number[];
	stats: BoardStats | undefined;
}

/**
 * SPI subgroups, oldest first, the newest `limit`: one board per point (its pads, or its
 * aggregates), or, for I-MR and for n consecutive boards, each board's mean as one value.
 */
export function groupBoards(
	boards: readonly BoardValues[],
	c: Pick<ChartCharacteristic, 'subgroupMode' | 'subgroupSize' | 'chartKind'>,
	limit: number
): SourceSubgroup[] {
	const perPoint = valuesPerPoint(c);
	const boardMean = (b: BoardValues) =>
		b.stats ? b.stats.mean : b.values.reduce((a, v) => a + v, 0) / b.values.length;
	const out: SourceSubgroup[] = [];
	if (perPoint === 1 && c.chartKind !== 'i-mr') {
		for (const b of boards) {
			out.push({
				key: `board:${b.id}`,
				label: `${b.serial} · ${b.lineCode}`,
				boardId: b.id,
				boardIds: [b.id],
				at: b.at,
				values: b.values,
				stats: b.stats
			});
		}
	} else {
		const full = boards.length - (boards.length % perPoint);
		for (let i = 0; i < full; i += perPoint) {
			const group = boards.slice(i, i + perPoint);
			const last = group[group.length - 1];
			out.push({
				key: `board:${group[0].id}`,
				label:
					perPoint === 1
						? `${last.serial} · ${last.lineCode}`
						: `${group[0].serial}…${last.serial} · ${last.lineCode}`,
				boardId: last.id,
				boardIds: group.map((g) => g.id),
				at: last.at,
				values: group.map(boardMean)
			});
		}
	}
	return out.slice(-limit);
}
