export { QueryReader, checkRange, type FieldProblem } from './query';
export {
	transferEfficiency,
	MAX_PADS_SCANNED,
	MAX_STENCILS,
	type TeAnswer,
	type TeFilters
} from './transfer-efficiency';
export { readTeFilters } from './te-query';
