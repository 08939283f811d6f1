/** SPI inspection data on the server: the one ingest service, queries, profiles, the watcher. */
export * from './ingest-service';
export * from './queries';
export * from './profiles';
export * from './progress';
export * from './archive';
export * from './upload-body';
export * from './watcher';
export * from './demo';
