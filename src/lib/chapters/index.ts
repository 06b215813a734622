/** Chapter rules and exports, shared by the browser and the server (pure, no I/O). */
export * from './rules';
export * from './export';
export * from './start';
