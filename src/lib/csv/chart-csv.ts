import type { ChartView, ChartViewPoint } from '$lib/spc/view-types';
import { writeCsv, type CsvCell } from './write-csv';

export const CHART_CSV_HEADER = [
	'index',
	'label',
	'time',
	'n',
	'location',
	'dispersion',
	'moving_range',
	'excluded',
	'signals'
] as const;

/** A chart's points as CSV (the chart page's download): labels are board serials, so text. */
export function chartCsv(chart: Pick<ChartView, 'points' | 'violations'>): string {
	const rules = (p: ChartViewPoint) =>
		chart.violations
			.filter((v) => v.index === p.index)
			.map((v) => `${v.chart}:${v.rule}`)
			.join(' ');
	const rows: CsvCell[][] = chart.points.map((p) => [
		p.index + 1,
		p.label,
		p.at ? new Date(p.at) : null,
		p.size,
		p.location,
		p.dispersion,
		p.movingRange ?? null,
		p.excluded ? 'yes' : '',
		rules(p)
	]);
	return writeCsv([[...CHART_CSV_HEADER], ...rows]);
}
