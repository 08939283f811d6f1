// The CFX endpoint (IPC-2591 over AMQP 1.0): receiver, storage, admin queries.
export * from './store';
export * from './receiver';
export * from './oee';
