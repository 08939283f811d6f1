/**
 * Public surface of the SPC engine, grouped by topic. Pure TypeScript: no framework,
 * database or I/O imports; inputs are never mutated.
 */

// Errors
export { SpcInputError } from './spc-input-error';

// Distributions and numerics
export { erf, erfc, normalCdf, normalPdf } from './normal-distribution';
export { inverseNormalCdf } from './inverse-normal-cdf';
export { logGamma, regularizedGammaP } from './gamma-functions';
export { chiSquareCdf, chiSquareQuantile } from './chi-square-quantile';
export { gaussLegendre } from './gauss-legendre';
export { mean, range, sampleStandardDeviation, quantile } from './summary-statistics';

// Chart constants
export {
	chartConstants,
	chartConstantsTable,
	c4,
	standardDeviationFactors,
	MIN_SUBGROUP_SIZE,
	MAX_RANGE_SUBGROUP_SIZE,
	type ChartConstants
} from './chart-constants';

// Control charts (Phase I limits, Phase II evaluation)
export type {
	ChartKind,
	ChartLimits,
	ChartPoint,
	ControlChart,
	ControlLimits,
	LimitOptions
} from './chart-types';
export {
	xbarRChart,
	xbarRLimits,
	xbarRPoints,
	XBAR_R_MAX_SUBGROUP_SIZE,
	XBAR_MIN_SUBGROUPS
} from './xbar-r-chart';
export { xbarSChart, xbarSLimits, xbarSPoints } from './xbar-s-chart';
export {
	individualsChart,
	individualsLimits,
	individualsPoints,
	INDIVIDUALS_MIN_VALUES
} from './individuals-chart';
export {
	betweenWithinChart,
	betweenWithinLimits,
	betweenWithinPoints
} from './between-within-chart';
export { buildChart, chartPoints, computeLimits } from './control-chart';
export { evaluateChart, type ChartPart, type Violation } from './evaluate-chart';

// Run rules and zones
export {
	detectRunRules,
	RULE_IDS,
	DEFAULT_RULES,
	BEYOND_LIMIT_RULES,
	RULE_DESCRIPTIONS,
	type RuleId,
	type RuleHit
} from './run-rules';
export { zoneBoundaries, zonePosition, type ZoneBoundaries } from './zones';

// Capability
export {
	capabilityFromSummary,
	processCapability,
	type CapabilityInput,
	type CapabilityResult,
	type CapabilitySummaryInput
} from './capability';
export { capabilityJson, type CapabilityJson } from './capability-json';
export { cpConfidenceInterval, cpkConfidenceInterval, type Interval } from './capability-intervals';
export { expectedOutOfSpec, type ExpectedOutOfSpec } from './expected-out-of-spec';
export {
	capabilityHistogram,
	type CapabilityHistogram,
	type HistogramBin,
	type HistogramOptions
} from './capability-histogram';
export {
	assessCapability,
	countOutOfSpec,
	cpkLowerBound,
	cpLowerBound,
	thresholdErrors,
	thresholdsFromStored,
	DEFAULT_CAPABILITY_THRESHOLDS,
	THRESHOLD_SOURCE,
	VERDICT_WORDS,
	type AssessmentInput,
	type CapabilityAssessment,
	type CapabilityThresholds,
	type CapabilityVerdict,
	type ObservedOutOfSpec,
	type OpenSignalRef
} from './capability-assessment';

export { pointKeyWords } from './point-key';
export { paretoRows, type ParetoRow } from './pareto';

// API core
export {
	analyzeStudy,
	parseAnalyzeBody,
	type AnalyzeOutcome,
	type AnalyzeResult,
	type FieldError,
	type ParsedBody
} from './analyze';
export {
	SPC_API_CHARTS,
	spcAnalyzeRequestSchema,
	spcChartSchema,
	spcRuleSchema,
	type SpcAnalyzeRequest
} from './analyze-request';

// Stored charts: inputs as plain data, computed once
export {
	groupBoards,
	groupRuns,
	printParameterValue,
	valuesPerPoint,
	type BoardStats,
	type BoardValues,
	type ChartCharacteristic,
	type PrintRunValues,
	type RunValue,
	type SourceSubgroup
} from './chart-input';
export {
	computeChart,
	engineData,
	needsPadEvidence,
	phaseOneLimits,
	pointsFor,
	ruleList,
	type ChartInputs,
	type ComputedChart,
	type PadEvidence
} from './chart-detail';
export { pooledStats, summaryCapability, type SubgroupStats } from './summary-capability';
export type { CapabilityView, ChartView, ChartViewPoint } from './view-types';
export {
	baselineLimits,
	DEFAULT_MIN_BASELINE_SUBGROUPS,
	exclusionReason,
	isMinBaselineSubgroups,
	LimitsError,
	type BaselineLimits
} from './limits-lifecycle';
export { causeChoiceError, cleanList, DEFAULT_CAUSE_LISTS, type CauseLists } from './cause-lists';
export {
	runIdFor,
	signalCandidates,
	type RunMember,
	type SignalCandidate
} from './signal-evaluation';
export {
	acknowledgeBodySchema,
	chartJson,
	chartQuery,
	signalJson,
	signalQuery,
	type ChartJsonInput,
	type SignalJsonInput,
	type SignalQuery
} from './api-json';
export {
	chartLine,
	describeSignal,
	digestMail,
	ruleText,
	signalMail,
	type SignalText
} from './signal-text';
export {
	sortSummaryRows,
	summaryRow,
	type ChartSummaryRow,
	type SummaryInput
} from './chart-summary';
export {
	readAcknowledgeForm,
	type AcknowledgeFormRead,
	type AcknowledgeRequest
} from './acknowledge-form';
export { widerScopeIds, type BoardSide, type ScopeMember } from './ack-scope';
export { inAreaRatioBand, type AreaRatioBand } from './pad-selection';
