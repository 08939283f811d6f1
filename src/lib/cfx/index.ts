// IPC-CFX (IPC-2591) messages → Rollbead records: pure, no framework or database imports.
export * from './decode';
export * from './map';
export * from './spi-csv';
export * from './oee';
export * from './event-words';
