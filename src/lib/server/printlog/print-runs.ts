/**
 * The print-run service, one file per concern: reading and shaping runs (run-view, run-queries),
 * starting (run-start), ending (run-end), correcting (run-correct), the CSV export (run-csv).
 * Starting, ending and correcting raise the run's control-chart signals themselves (run-signals).
 */
export {
	apiDeviation,
	type ApiDeviation,
	type RunFilters,
	type RunView,
	type StoredDeviation
} from './run-view';
export { getRun, inspectedProductOfSerial, lastRunOnLine, listRuns, openRuns } from './run-queries';
export { startRun, type StartedRun } from './run-start';
export { endRun } from './run-end';
export { correctRun, type RunCorrection } from './run-correct';
export { RUN_CSV_COLUMNS, runsToCsv } from './run-csv';
