/** Stencil design check, server side: stencils, apertures, imports, site thresholds, evaluation. */
export * from './stencils';
export * from './apertures';
export * from './thresholds';
export * from './evaluation';
export * from './upload';
export * from './compare';
export * from './demo';
export * from './limits-env';
export * from './parse-thread';
export * from './page-cache';
export * from './site-te-model';
