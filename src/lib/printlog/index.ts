/**
 * Public surface of the print-log rules, grouped by topic. Pure TypeScript: no framework,
 * database or I/O imports; inputs are never mutated. Defaults and their sources:
 * reference/printlog/defaults.md.
 */

// Errors and time
export {
	formatFieldError,
	describeValue,
	PrintlogInputError,
	type FieldError
} from './field-error';
export { toEpochMs, type Instant } from './to-epoch-ms';

// Parameter catalogue and recipe windows
export {
	NUMERIC_PARAMETER_KEYS,
	AMBIENT_PARAMETER_KEYS,
	CATEGORICAL_PARAMETER_KEYS,
	CATEGORICAL_LABELS,
	NUMERIC_PARAMETERS,
	REQUIRED_RECIPE_PARAMETERS,
	PRINT_STROKES,
	BLADE_TYPES,
	BOARD_SUPPORTS,
	PRESSURE_N_PER_MM,
	DEFAULT_BLADE_LENGTH_MM,
	pressureWindowKg,
	squeegeePressureNewtons,
	physicalRangeProblem,
	isWindowedParameterKey,
	isCategoricalParameterKey,
	type NumericParameterKey,
	type AmbientParameterKey,
	type WindowedParameterKey,
	type CategoricalParameterKey,
	type NumericWindow,
	type NumericParameterSpec,
	type PhysicalRange,
	type PrintStroke,
	type BladeType,
	type BoardSupport
} from './parameters';
export {
	WIPE_STEPS,
	parseWipeMode,
	wipeModeString,
	allWipeModes,
	type WipeStep
} from './wipe-mode';
export {
	validateWindow,
	validateRecipe,
	validateRunParameters,
	normaliseCategorical,
	checkRunAgainstRecipe,
	missingDeviationReasons,
	deviationReasonErrors,
	describeDeviation,
	type Recipe,
	type RecipeParameters,
	type RunParameters,
	type Deviation,
	type NumericDeviation,
	type CategoricalDeviation
} from './recipe-window';

// Paste lots
export {
	DEFAULT_PASTE_HANDLING,
	FLUX_CLASS_PATTERN,
	resolvePasteHandling,
	validatePasteLot,
	lotExpiresAtMs,
	lotDateWarnings,
	MAX_EXPIRY_AHEAD_DAYS,
	type PasteLot,
	type PasteHandlingSettings
} from './paste-lot';
export {
	PASTE_EVENTS,
	nextPasteState,
	pasteTransitionProblem,
	replayPasteEvents,
	minutesOutOfCold,
	checkNextPasteEvent,
	formatMinutes,
	type PasteEvent,
	type PasteEventType,
	type PasteState,
	type PasteTimeline
} from './paste-events';
export { assessLotForRun, type LotAssessment, type LotReason } from './assess-lot-for-run';
export { isLeadBearing, leadHandlingCaution, solventCleaningCaution } from './lead-caution';

// Stencils
export {
	STENCIL_STATES,
	STENCIL_LIFE_WARN_PCT,
	stencilTransitionProblem,
	assessStencilForRun,
	type StencilState,
	type StencilForRun,
	type StencilReason,
	type StencilAssessment
} from './stencil-life';
export {
	DEFAULT_TENSION,
	MAX_PLAUSIBLE_TENSION_N_PER_CM,
	checkTensionReadings,
	type TensionSettings,
	type TensionCheck
} from './stencil-tension';

// Runs and scanning
export {
	validateRunTimes,
	findOverlappingOpenRun,
	type RunTimes,
	type RunOnLine
} from './run-times';
export {
	createWedgeBuffer,
	scanFieldValue,
	type WedgeBuffer,
	type WedgeOptions
} from './barcode-wedge';
export { matchScannedCode, normaliseScannedCode, type CodeCandidate } from './match-scanned-code';
export {
	MAX_BOARD_SERIAL_LENGTH,
	normaliseBoardSerial,
	boardSerialProblem,
	parseBoardSerial
} from './board-serial';
export { runChanges, describeRunChange, parameterLabel, type RunChange } from './run-changes';
export {
	BOARD_SIDES,
	checkProductFit,
	normaliseAlloy,
	resolveProductFit,
	type BoardSide,
	type ProductFitCheck,
	type ProductFitOutcome,
	type ProductFitReason,
	type ProductFitRefusal,
	type ProductFitRules,
	type RunMaterials,
	type StencilApproval
} from './product-fit';
