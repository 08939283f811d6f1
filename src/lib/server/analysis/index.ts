export { QueryReader, checkRange, type FieldProblem } from './query';
export {
	transferEfficiency,
	MAX_PADS_SCANNED,
	MAX_STENCILS,
	type TeAnswer,
	type TeFilters
} from './transfer-efficiency';
export { readTeFilters } from './te-query';
export { transferEfficiencyOffThread } from './te-thread';
export {
	adoptLearnedLimit,
	learnedLimit,
	learnedLimits,
	proposedLimit,
	DEFAULT_TE_FLOOR,
	type AdoptedLimit,
	type LearnedLimit
} from './learned-limit';
export {
	parameterEffect,
	readParameterFilters,
	ANALYSIS_OUTCOMES,
	ANALYSIS_PARAMETERS,
	CORRELATION_CAUTION,
	MAX_RUNS,
	type AnalysisOutcome,
	type AnalysisParameter,
	type ParameterAnswer,
	type ParameterFilters
} from './parameters';
export {
	readTraceQuery,
	traceBoard,
	MAX_LISTED_PADS,
	MAX_TRACE_BOARDS,
	type BoardTrace,
	type TraceAnswer
} from './trace';
export {
	predictedTeForStencil,
	readStencilQuery,
	stencilWear,
	DEFAULT_WEAR_DROP,
	MAX_LISTED_APERTURES,
	type PredictedTeAnswer,
	type WearAnswer
} from './stencil-evidence';
export {
	firstPassYield,
	readYieldFilters,
	MAX_YIELD_BOARDS,
	YIELD_GROUPINGS,
	type YieldAnswer,
	type YieldFilters
} from './first-pass-yield';
export {
	failureMap,
	padFailures,
	padClassOf,
	readFailureMapFilters,
	MAX_MAP_PADS,
	type FailureMapAnswer,
	type FailureMapFilters
} from './failure-map';
export {
	isoWeekStartMs,
	lineWeekReport,
	runReport,
	MAX_REPORT_BOARDS,
	type LineWeekReport,
	type ReportSignal,
	type RunReport
} from './reports';
