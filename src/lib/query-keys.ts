/**
 * Query-key roots shared across features, general → specific. A feature extends a root with
 * its own inputs (`[...queryKeys.batches(slug), 'list', filters]`), and another feature can
 * invalidate everything under the root without importing that feature.
 */
export const queryKeys = {
  me: () => ['me'] as const,
  workspace: (slug: string) => ['workspaces', slug] as const,
  /** Every list of a workspace's batches (invalidate after an upload). */
  batches: (slug: string) => ['workspaces', slug, 'batches'] as const,
  /** One batch and what hangs off it (structures, reviews). */
  batch: (batchId: string) => ['batches', batchId] as const,
  structure: (structureId: string) => ['structures', structureId] as const,
};
