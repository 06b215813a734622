// Spec cards and the arithmetic behind them: pure, no I/O, shared by browser and server.
export * from './errors';
export * from './units';
export * from './tyres';
export * from './tyre-change';
export * from './lift';
export * from './cards';
