import { queryOptions, useQuery } from '@tanstack/react-query';
import { structureListQuerySchema } from '@shared/contracts/api';
import { batchQueryOptions, isLive, LIVE_INTERVAL, type BatchDetail } from './get-batch';
import { fetchBatchStructures } from './get-batch-structures';

/** Largest number of rows read for the batch charts (4 pages of 500). */
export const SAMPLE_LIMIT = 2000;
const PAGE = 500;

export interface DisplacementSample {
  /** maxDisplacement of each structure read (null while not done or failed), Å. */
  values: (number | null)[];
  /** Structures in the batch. */
  total: number;
}

/**
 * The maximum displacement of every structure of the batch, read page by page from
 * GET /api/batches/:id/structures, up to {@link SAMPLE_LIMIT} rows; the chart says when it
 * shows only part of a larger batch.
 */
export async function fetchDisplacementSample(batchId: string, signal?: AbortSignal): Promise<DisplacementSample> {
  const values: (number | null)[] = [];
  let total = 0;
  for (let page = 1; values.length < SAMPLE_LIMIT; page++) {
    const query = structureListQuerySchema.parse({ page, pageSize: PAGE, sort: 'name' });
    const result = await fetchBatchStructures(batchId, query, signal);
    total = result.total;
    values.push(...result.items.map((r) => r.maxDisplacement));
    if (result.items.length < PAGE || values.length >= total) break;
  }
  return { values, total };
}

export const displacementSampleQueryOptions = (slug: string, batchId: string) =>
  queryOptions({
    queryKey: [...batchQueryOptions(slug, batchId).queryKey, 'displacement-sample'] as const,
    queryFn: ({ signal }) => fetchDisplacementSample(batchId, signal),
    staleTime: 5_000,
  });

/** Not a suspense query: the charts load after the table, in their own lazy chunk. */
export function useDisplacementSample(slug: string, batchId: string, status: BatchDetail['status']) {
  return useQuery({ ...displacementSampleQueryOptions(slug, batchId), refetchInterval: isLive(status) ? LIVE_INTERVAL * 2 : false });
}
