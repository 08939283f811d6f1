// Each feature keeps its tables in its own file; drizzle-kit reads them all through this index.
export * from './foundation';
export * from './stencils';
export * from './printlog';
export * from './spc';
export * from './spi';
export * from './cfx';
export * from './products';
