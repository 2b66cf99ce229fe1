/**
 * Every TypeORM entity class, listed explicitly (no globs: tsx and bundlers both load this).
 * Add a new entity here and write its migration (see DEVELOPERS.md).
 */
export const entities: Function[] = [];
