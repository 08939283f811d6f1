/**
 * Public API of the stencil aperture module (pure, framework-free). Gerber import lives in the
 * `gerber*` files of this folder and is exported from there.
 */
export * from './aperture';
export * from './stencil-input-error';
export * from './polygon';
export * from './aperture-validation';
export * from './geometry';
export * from './outline';
export * from './area-ratio';
export * from './thresholds';
export * from './evaluate-aperture';
export * from './step-regions';
export * from './evaluate-stencil';
export * from './summary';
export * from './powder';
export * from './thickness-sweep';
export * from './csv-rows';
export * from './aperture-csv';
export * from './centroid-csv';
export * from './assign-refdes';
export * from './compare-revisions';
export * from './map-layers';
export * from './hit-index';
