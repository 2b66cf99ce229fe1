/**
 * Pointfold's shared TypeScript: the symmetry engine and the contracts spoken by the browser,
 * the server and the worker. Pure TypeScript: no Node, DOM, ORM or React imports.
 */
export * from './contracts/structure';
export * from './contracts/settings';
export * from './contracts/api';
export * from './elements';
export * from './engine';
export * from './formats';
