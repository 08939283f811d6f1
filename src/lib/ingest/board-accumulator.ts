import {
	addMeasureValue,
	emptyMeasureState,
	mergeMeasureStates,
	stateFromSummary,
	summariseMeasure,
	type MeasureState,
	type MeasureSummary
} from './measure-stats';
import { PAD_MEASURE_KEYS, type PadMeasureKey } from '../spi/measures';

/** The measures kept per board, named as in the parsed row (the catalogue's pad measures). */
export const AGGREGATED_MEASURES = PAD_MEASURE_KEYS;

/** One aggregated measure name. */
export type AggregatedMeasure = PadMeasureKey;

/** Result codes as stored: 0 pass, 1 warn, 2 fail. */
export type ResultCode = 0 | 1 | 2;

/** The fields of a pad row the accumulator reads. */
export type AggregatableRow = Record<AggregatedMeasure, number> & { result: ResultCode };

/** Per-board (or pooled) figures: one summary per measure and counts by result. */
export type BoardAggregate = Record<AggregatedMeasure, MeasureSummary> & {
	/** Pad rows added. */
	rows: number;
	results: { pass: number; warn: number; fail: number };
};

/** Running per-board figures. `add` updates in place; `merge` and `finish` return new values. */
export interface BoardAccumulator {
	/** Add one pad row. NaN measures are skipped for that measure only. */
	add(row: AggregatableRow): void;
	/** Same as `add` without building a row object (the parser's hot path). */
	addMeasures(
		volumePct: number,
		areaPct: number,
		heightUm: number,
		offsetXUm: number,
		offsetYUm: number,
		result: ResultCode
	): void;
	/** A new accumulator holding this one's rows and `other`'s; both stay unchanged. */
	merge(other: BoardAccumulator): BoardAccumulator;
	/** Snapshot of the current figures (adding more rows afterwards is allowed). */
	finish(): BoardAggregate;
	/** Copy of the running state, for `merge`. */
	state(): AccumulatorState;
}

/** Raw running state of an accumulator. */
export interface AccumulatorState {
	rows: number;
	measures: Record<AggregatedMeasure, MeasureState>;
	results: [number, number, number];
}

function emptyState(): AccumulatorState {
	return {
		rows: 0,
		measures: {
			volumePct: emptyMeasureState(),
			areaPct: emptyMeasureState(),
			heightUm: emptyMeasureState(),
			offsetXUm: emptyMeasureState(),
			offsetYUm: emptyMeasureState()
		},
		results: [0, 0, 0]
	};
}

function copyState(s: AccumulatorState): AccumulatorState {
	return {
		rows: s.rows,
		measures: {
			volumePct: { ...s.measures.volumePct },
			areaPct: { ...s.measures.areaPct },
			heightUm: { ...s.measures.heightUm },
			offsetXUm: { ...s.measures.offsetXUm },
			offsetYUm: { ...s.measures.offsetYUm }
		},
		results: [s.results[0], s.results[1], s.results[2]]
	};
}

function summarise(s: AccumulatorState): BoardAggregate {
	return {
		rows: s.rows,
		volumePct: summariseMeasure(s.measures.volumePct),
		areaPct: summariseMeasure(s.measures.areaPct),
		heightUm: summariseMeasure(s.measures.heightUm),
		offsetXUm: summariseMeasure(s.measures.offsetXUm),
		offsetYUm: summariseMeasure(s.measures.offsetYUm),
		results: { pass: s.results[0], warn: s.results[1], fail: s.results[2] }
	};
}

function mergeStates(a: AccumulatorState, b: AccumulatorState): AccumulatorState {
	const measures = {} as Record<AggregatedMeasure, MeasureState>;
	for (const m of AGGREGATED_MEASURES)
		measures[m] = mergeMeasureStates(a.measures[m], b.measures[m]);
	return {
		rows: a.rows + b.rows,
		measures,
		results: [a.results[0] + b.results[0], a.results[1] + b.results[1], a.results[2] + b.results[2]]
	};
}

/**
 * Create a per-board accumulator: count, mean, sample sd (n − 1), min, max and range of volume %,
 * area %, height µm and X/Y offset µm, plus pass/warn/fail counts. One pass, O(1) memory
 * (Welford's update); accumulators merge exactly (Chan et al.) so a chart can pool boards.
 * Used by the ingest parser for every board inspection in a file.
 * @example
 * const acc = createBoardAccumulator();
 * acc.add({ volumePct: 98, areaPct: 100, heightUm: 120, offsetXUm: 5, offsetYUm: -5, result: 0 });
 * acc.add({ volumePct: 102, areaPct: 100, heightUm: 124, offsetXUm: 7, offsetYUm: -3, result: 2 });
 * acc.finish().volumePct // { count: 2, mean: 100, sd: 2.8284271247461903, min: 98, max: 102, range: 4 }
 */
export function createBoardAccumulator(initial?: AccumulatorState): BoardAccumulator {
	const s = initial ? copyState(initial) : emptyState();
	const m = s.measures;
	const accumulator: BoardAccumulator = {
		add(row) {
			accumulator.addMeasures(
				row.volumePct,
				row.areaPct,
				row.heightUm,
				row.offsetXUm,
				row.offsetYUm,
				row.result
			);
		},
		addMeasures(volumePct, areaPct, heightUm, offsetXUm, offsetYUm, result) {
			s.rows++;
			addMeasureValue(m.volumePct, volumePct);
			addMeasureValue(m.areaPct, areaPct);
			addMeasureValue(m.heightUm, heightUm);
			addMeasureValue(m.offsetXUm, offsetXUm);
			addMeasureValue(m.offsetYUm, offsetYUm);
			s.results[result]++;
		},
		merge(other) {
			return createBoardAccumulator(mergeStates(s, other.state()));
		},
		finish() {
			return summarise(s);
		},
		state() {
			return copyState(s);
		}
	};
	return accumulator;
}

/**
 * Pool finished aggregates (e.g. per-board figures read back from the database) into one, as if
 * all their rows had been added to one accumulator. sd is rebuilt as m2 = sd²·(n − 1), so the
 * result matches a direct computation to rounding error. Returns an empty aggregate for [].
 * @example mergeBoardAggregates([]).rows // 0
 */
export function mergeBoardAggregates(aggregates: readonly BoardAggregate[]): BoardAggregate {
	let total = emptyState();
	for (const a of aggregates) {
		const s = emptyState();
		s.rows = a.rows;
		for (const name of AGGREGATED_MEASURES) s.measures[name] = stateFromSummary(a[name]);
		s.results = [a.results.pass, a.results.warn, a.results.fail];
		total = mergeStates(total, s);
	}
	return summarise(total);
}
