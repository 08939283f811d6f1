/**
 * Analysis of the site's own prints: regression, correlation and the transfer-efficiency model.
 * Pure TypeScript (no framework, database or I/O imports); inputs are never mutated.
 */
export { AnalysisInputError } from './analysis-input-error';
export { regularizedBeta, studentTCdf, studentTQuantile } from './student-t';
export {
	linearRegression,
	meanResponseBand,
	meanResponseInterval,
	type LinearFit,
	type MeanResponseInterval
} from './linear-regression';
export { pearsonCorrelation, type Correlation } from './correlation';
export { seededRandom, type SeededRandom } from './seeded-random';
export {
	fitTeCurve,
	learnedMinAreaRatio,
	predictTe,
	teBand,
	teBandAt,
	BAND_DENSE_MAX_AR,
	BAND_STEP_AR,
	MAX_BAND_HALF_WIDTH_AT_LIMIT,
	MIN_FIT_BINS,
	MIN_SCALE_AR,
	type LearnedLimit,
	type TeBandPoint,
	type TeBinPoint,
	type TeCurve,
	type TeFit,
	type TeFitOutcome
} from './te-model';
export {
	analyseTransferEfficiency,
	areaRatioBin,
	summarizeTeBin,
	AREA_RATIO_BIN_MAX,
	AREA_RATIO_BIN_WIDTH,
	MIN_PADS_PER_FITTED_BIN,
	TE_BUCKET_MAX,
	TE_BUCKET_WIDTH,
	TRIM_MADS,
	type TeAnalysis,
	type TeBinSummary,
	type TeHistogramRow
} from './te-bins';
export { runOutcome, VOLUME_WINDOW_PCT, type RunOutcome, type RunOutcomeSums } from './run-outcome';
export {
	failureKindOf,
	pareto,
	DEFAULT_FAILURE_WINDOWS,
	FAILURE_KINDS,
	FAILURE_KIND_LABELS,
	type FailureKind,
	type FailureWindows,
	type PadMeasures,
	type ParetoRow
} from './failure-kind';
