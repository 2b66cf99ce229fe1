import { createContext, useContext } from 'react';
import type * as z from 'zod';
import type { Role, userSchema, workspaceSchema } from '@shared/contracts/api';

/**
 * The workspace the current route is in, with the caller's role there. Provided by the
 * workspace layout (src/app) so every feature page can read it without importing another feature.
 */
export interface CurrentWorkspace {
  workspace: z.infer<typeof workspaceSchema>;
  role: Role;
  /** The signed-in user. */
  user: z.infer<typeof userSchema>;
}

export const WorkspaceContext = createContext<CurrentWorkspace | null>(null);

/** The current workspace and role; throws outside a `/w/:slug` route (a programming error). */
export function useCurrentWorkspace(): CurrentWorkspace {
  const value = useContext(WorkspaceContext);
  if (!value) throw new Error('useCurrentWorkspace() used outside a workspace route');
  return value;
}

/** Roles that may upload, cancel and re-snap (DESIGN.md: owner, chemist). */
export const canWrite = (role: Role) => role === 'owner' || role === 'chemist';
/** Roles that may accept, flag and sign off. */
export const canReview = (role: Role) => role === 'owner' || role === 'reviewer';
export const isOwner = (role: Role) => role === 'owner';
