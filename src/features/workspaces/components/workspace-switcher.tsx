import type * as z from 'zod';
import type { meSchema } from '@shared/contracts/api';
import { inputClass } from '@/components/ui/field';
import { cx } from '@/lib/cx';

type Membership = z.infer<typeof meSchema>['memberships'][number];

/**
 * Chooses the workspace: a native select (keyboard and screen-reader friendly), one option per
 * membership with the role in it. Choosing navigates via `onSwitch(slug)`.
 */
export function WorkspaceSwitcher({
  memberships,
  currentSlug,
  onSwitch,
}: {
  memberships: Membership[];
  currentSlug: string | undefined;
  onSwitch: (slug: string) => void;
}) {
  if (memberships.length === 0) return null;
  const known = memberships.some((m) => m.workspace.slug === currentSlug);
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor="workspace-switcher" className="text-xs font-medium tracking-wide text-ink-soft uppercase">
        Workspace
      </label>
      <select
        id="workspace-switcher"
        className={cx(inputClass, 'font-medium')}
        value={known ? currentSlug : ''}
        onChange={(e) => e.target.value && onSwitch(e.target.value)}
      >
        {!known && (
          <option value="" disabled>
            Choose a workspace
          </option>
        )}
        {memberships.map((m) => (
          <option key={m.workspace.id} value={m.workspace.slug}>
            {m.workspace.name} ({m.role})
          </option>
        ))}
      </select>
    </div>
  );
}
