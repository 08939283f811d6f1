import { sortSummaryRows, summaryRow, type ChartSummaryRow } from '$lib/spc';
import type { Db } from '../db';
import { chartDetail, listCharacteristics } from './chart-service';
import { openSignalCounts } from './signals';
import { getCapabilityThresholds } from './capability-settings';

export type { ChartSummaryRow };

/**
 * Every chart with its assessment and open signals, worst first: not stable (most open signals
 * first), then not capable, marginal, capable (lowest bound first), not assessed last.
 */
export function chartSummary(db: Db, limit = 200): ChartSummaryRow[] {
	const open = openSignalCounts(db);
	const thresholds = getCapabilityThresholds(db);
	const rows = listCharacteristics(db).map((c) =>
		summaryRow(chartDetail(db, c.id, { limit, thresholds }), open.get(c.id) ?? 0)
	);
	return sortSummaryRows(rows);
}
