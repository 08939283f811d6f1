/**
 * Columns of the analysis tables whose CSV a user downloads, kept out of the components so the
 * CSV they make can be tested (hostile cells: src/lib/csv/write-csv.test.ts), and the one way a
 * table becomes CSV rows (DataTable's download).
 */
import type { CsvCell } from '$lib/csv/write-csv';
import { formatNumber, formatPercent } from '$lib/format';
import type { Column, MapAnswer, WearAnswer } from './api';

/** Header and rows of a table's CSV: the columns with a `csv` name, unrounded values. */
export function csvTable<R>(
	columns: readonly Column<R>[],
	rows: readonly R[]
): { header: string[]; rows: CsvCell[][] } {
	const inCsv = columns.filter((c) => c.csv);
	return {
		header: inCsv.map((c) => c.csv!),
		rows: rows.map((r) => inCsv.map((c) => (c.value ?? c.text!)(r) as CsvCell))
	};
}

const n = (v: number) => v.toLocaleString('en-GB');

type Kind = MapAnswer['byKind'][number];
/** Failures by kind (the Pareto of one product). */
export const kindColumns: Column<Kind>[] = [
	{ label: 'Kind', csv: 'kind', value: (k) => k.kind, text: (k) => k.label },
	{ label: 'Fails', csv: 'fails', value: (k) => k.fails, text: (k) => n(k.fails), numeric: true },
	{
		label: 'Share',
		csv: 'share',
		value: (k) => k.share,
		text: (k) => formatPercent(k.share),
		numeric: true
	},
	{
		label: 'Cumulative',
		csv: 'cumulative_share',
		value: (k) => k.cumulativeShare,
		text: (k) => formatPercent(k.cumulativeShare),
		numeric: true
	}
];

type Pad = MapAnswer['pads'][number];
/** Pads failing most. */
export const worstPadColumns: Column<Pad>[] = [
	{ label: 'Refdes', csv: 'refdes', text: (p) => p.refdes },
	{ label: 'Pad', csv: 'pad', text: (p) => p.pad },
	{ label: 'Panel', csv: 'panel', value: (p) => p.panelIndex },
	{ label: 'Fails', csv: 'fails', value: (p) => p.fails, text: (p) => n(p.fails), numeric: true },
	{
		label: 'Fail rate',
		csv: 'fail_rate',
		value: (p) => p.failRate,
		text: (p) => formatPercent(p.failRate),
		numeric: true
	}
];

type Wipe = WearAnswer['sinceWipe'][number];
/** A stencil's prints since the last wipe. */
export const wipeColumns: Column<Wipe>[] = [
	{
		label: 'Prints since wipe',
		csv: 'prints_since_wipe',
		value: (g) => g.printsSinceWipe,
		text: (g) => String(g.printsSinceWipe),
		numeric: true
	},
	{
		label: 'Boards',
		csv: 'boards',
		value: (g) => g.boards,
		text: (g) => String(g.boards),
		numeric: true
	},
	{
		label: 'Mean TE',
		csv: 'te_mean',
		value: (g) => g.teMean,
		text: (g) => formatPercent(g.teMean),
		numeric: true
	},
	{
		label: 'Mean volume',
		csv: 'volume_mean_pct',
		value: (g) => g.volumeMean,
		text: (g) => `${formatNumber(g.volumeMean, 1)} %`,
		numeric: true
	}
];
