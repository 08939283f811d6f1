/**
 * SPI export ingest: canonical layout, mapping profiles, streaming row parser, fixed-point
 * helpers and per-board aggregates. Framework-free; the server's ingest service drives it.
 */

// Layout and profiles
export {
	CANONICAL_FIELDS,
	REQUIRED_FIELDS,
	OPTIONAL_FIELDS,
	FIELD_RANGES,
	MAX_TEXT_LENGTH,
	isCanonicalField,
	type CanonicalField
} from './canonical-fields';
export {
	CANONICAL_PROFILE,
	type MappingProfile,
	type DelimiterSetting,
	type VolumeMode,
	type BadRowPolicy
} from './mapping-profile';
export { resolveHeader, requiredFieldsFor, type ResolvedHeader } from './resolve-header';

// Mapping screen helpers
export { detectDelimiter, type Delimiter } from './detect-delimiter';
export { previewSample, type SamplePreview } from './preview-sample';
export { suggestColumnMapping, type ColumnMappingSuggestion } from './suggest-column-mapping';

// Parsing
export {
	createSpiRowParser,
	parseSpiStream,
	type SpiRowParser,
	type SpiRowParserOptions,
	type SpiParseSummary,
	type BoardInspection
} from './spi-row-parser';
export {
	batchToRows,
	boardInspectionKey,
	createSpiRowBatch,
	trimSpiRowBatch,
	type SpiRowBatch,
	type SpiRow,
	type BoardHeader
} from './spi-row-batch';
export { scanFieldBounds, splitQuotedLine, type SplitResult } from './split-delimited-line';
export {
	compileSerialPattern,
	serialFromText,
	MAX_SERIAL_PATTERN_LENGTH,
	type SerialPatternCheck
} from './serial-pattern';
export {
	formatIngestIssue,
	createIssueCollector,
	DEFAULT_ISSUE_LIMIT,
	type IngestIssue,
	type IssueCollector
} from './ingest-issue';

// Time
export {
	compileTimestampPattern,
	createTimestampParser,
	type ParsedTimestamp,
	type TimestampReader
} from './parse-timestamp';
export {
	zonedTimeToUtc,
	timeZoneOffsetMs,
	isValidTimeZone,
	type LocalDateTime,
	type Disambiguation
} from './zoned-time-to-utc';

// Numbers
export { parseDecimal } from './parse-decimal';
export {
	DEFAULT_SPI_PARSE_LIMITS,
	SPI_PARSE_LIMIT_ENV,
	spiParseLimitsFromEnv,
	formatByteLimit,
	type SpiParseLimits
} from './parse-limits';

// Storage and aggregates
export { encodeCentis, decodeCentis } from './encode-centis';
export {
	createBoardAccumulator,
	mergeBoardAggregates,
	AGGREGATED_MEASURES,
	type BoardAccumulator,
	type BoardAggregate,
	type AccumulatorState,
	type AggregatableRow,
	type AggregatedMeasure,
	type ResultCode
} from './board-accumulator';
export {
	emptyMeasureState,
	addMeasureValue,
	mergeMeasureStates,
	summariseMeasure,
	stateFromSummary,
	type MeasureState,
	type MeasureSummary
} from './measure-stats';
