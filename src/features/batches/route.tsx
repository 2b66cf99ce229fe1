import type { LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { batchesQueryOptions, filtersFromSearch } from './api/get-batches';
import { BatchesPage } from './components/batches-page';

/** Lazy route module for `/w/:slug`. */
export async function loader({ params, request }: LoaderFunctionArgs) {
  const filters = filtersFromSearch(new URL(request.url).searchParams);
  await queryClient.ensureQueryData(batchesQueryOptions(params.slug!, filters));
  return null;
}

export const Component = BatchesPage;
