import { NewBatchPage } from './components/new-batch-page';

/** Lazy route module for `/w/:slug/new`. Needs no data beyond /api/me (the workspace defaults). */
export const Component = NewBatchPage;
