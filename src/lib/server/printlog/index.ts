/**
 * Print-log services: recipes, print runs, paste lots, stencil life and trends over the
 * database. Routes call these; the rules themselves are in $lib/printlog.
 */
export { PrintlogRequestError } from './request-error';
export * from './lookups';
export * from './recipes';
export * from './paste-lots';
export * from './stencil-life';
export * from './print-runs';
export * from './trends';
export { queryObject } from './query-object';
export {
	stencilLifeApiView,
	stencilEntryErrors,
	type StencilLifeApiView
} from './stencil-life-api';
export * from './product-fit';
