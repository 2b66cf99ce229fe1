import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from '@/lib/api-client';

/** POST /auth/sign-out — ends the session. */
export function signOut() {
  return apiFetch('/auth/sign-out', { method: 'POST' });
}

/** Signs out, then drops every cached answer so the next person sees nothing of this one's data. */
export function useSignOut({ onDone }: { onDone: () => void }) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: () => {
      queryClient.clear();
      onDone();
    },
  });
}
