import type { LoaderFunctionArgs } from 'react-router-dom';
import { useParams } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { batchQueryOptions } from './api/get-batch';
import { batchReviewsQueryOptions } from './api/get-batch-reviews';
import { batchStructuresQueryOptions, parseStructureListQuery } from './api/get-batch-structures';
import { BatchPage } from './components/batch-page';

/**
 * Lazy route module for /w/:slug/batches/:batchId. The loader warms the cache for the batch,
 * the page of rows the URL asks for, and the review history; an API 404 (unknown batch, or one
 * of another workspace) reaches the route's error element, which shows the 404 page.
 */
export async function loader({ params, request }: LoaderFunctionArgs) {
  const slug = params.slug!;
  const batchId = params.batchId!;
  const query = parseStructureListQuery(new URL(request.url).searchParams);
  await Promise.all([
    queryClient.ensureQueryData(batchQueryOptions(slug, batchId)),
    queryClient.ensureQueryData(batchStructuresQueryOptions(slug, batchId, query)),
    queryClient.ensureQueryData(batchReviewsQueryOptions(slug, batchId)),
  ]);
  return null;
}

export function Component() {
  const { slug, batchId } = useParams();
  return <BatchPage key={batchId} slug={slug!} batchId={batchId!} />;
}
