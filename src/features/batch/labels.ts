import type * as z from 'zod';
import type { reviewStateSchema } from '@shared/contracts/api';
import type { FlagCode } from '@shared/contracts/structure';
import type { BadgeTone } from '@/components/ui/badge';

/** Short words for a flag in the table (the full sentence is the structure's flagNote). */
export const FLAG_LABELS: Record<FlagCode, { label: string; tone: BadgeTone; hint: string }> = {
  'over-budget': { label: 'over budget', tone: 'ochre', hint: 'An atom moved more than the displacement budget' },
  'knife-edge': { label: 'knife edge', tone: 'ochre', hint: 'The group changes within a factor of 2 of the tolerance' },
  'charge-multiplicity': { label: 'charge/mult.', tone: 'brick', hint: 'Charge and multiplicity contradict the electron count' },
  'close-contact': { label: 'close contact', tone: 'brick', hint: 'Two atoms closer than 0.5 Å' },
  'higher-symmetry': { label: 'higher symmetry', tone: 'ochre', hint: 'Snapped to a group the input supports only loosely: may be a saddle point' },
  'not-closed': { label: 'not closed', tone: 'ochre', hint: 'The operations found did not close into a group; the largest closed subgroup was used' },
  'target-not-subgroup': { label: 'target refused', tone: 'ochre', hint: 'The requested target could not be used; the perceived group was kept' },
};

export type ReviewState = z.infer<typeof reviewStateSchema>;

export const REVIEW_LABELS: Record<ReviewState, { label: string; tone: BadgeTone }> = {
  pending: { label: 'Pending', tone: 'neutral' },
  accepted: { label: 'Accepted', tone: 'moss' },
  flagged: { label: 'Flagged', tone: 'brick' },
};
