import type { LoaderFunctionArgs } from 'react-router-dom';
import { useParams } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { structureQueryOptions } from './api/get-structure';
import { StructurePage } from './components/structure-page';

/**
 * Lazy route module for /w/:slug/structures/:structureId. An API 404 (unknown structure, or
 * one of another workspace) reaches the route's error element, which shows the 404 page.
 */
export async function loader({ params }: LoaderFunctionArgs) {
  await queryClient.ensureQueryData(structureQueryOptions(params.slug!, params.structureId!));
  return null;
}

export function Component() {
  const { slug, structureId } = useParams();
  return <StructurePage key={structureId} slug={slug!} structureId={structureId!} />;
}
