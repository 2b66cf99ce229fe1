import { forwardRef, type InputHTMLAttributes, type ReactNode } from 'react';
import { useFormContext, useWatch, type FieldErrors, type FieldValues } from 'react-hook-form';
import { outputFormats, type OutputFormat } from '@shared/contracts/settings';
import { cx } from '@/lib/cx';
import { Field, TextField, inputClass } from './field';
import { focusRing } from './focus';

/**
 * The snap settings as form fields (tolerance, target, frame, displacement budget, default
 * charge and multiplicity, output formats), for any react-hook-form form that holds a
 * `SnapSettings` object at `prefix` and validates with `snapSettingsSchema`. Used by the
 * new-batch form and by the workspace defaults.
 */

export const formatLabels: Record<OutputFormat, string> = {
  xyz: 'XYZ',
  extxyz: 'Extended XYZ',
  mol: 'MDL molfile',
  qcschema: 'QCSchema JSON',
  unique: 'Symmetry-unique atoms',
};

/** One sentence per settings field, shown instead of the schema's generic message. */
export const settingsMessages: Record<string, string> = {
  tolerance: 'Tolerance must be a number above 0 and at most 1 Å.',
  displacementBudget: 'Displacement budget must be a number above 0 and at most 5 Å.',
  charge: 'Charge must be a whole number from −20 to 20.',
  multiplicity: 'Multiplicity must be a whole number from 1 to 20, or empty for the lowest consistent one.',
  'target.group': 'Name the target group in Schoenflies notation, e.g. C2v, D3h or Td.',
  target: 'Choose a target.',
  outputFormats: 'Choose at least one output format.',
  frame: 'Choose a frame.',
};

/** `''` → NaN (so "required" reads as a number error), otherwise the number typed. */
export const toNumber = (v: unknown) => (v === '' || v === null || v === undefined ? Number.NaN : Number(v));
/** `''` → null (multiplicity: lowest consistent with the electron count). */
export const toNullableNumber = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

function errorAt(errors: FieldErrors<FieldValues>, path: string): boolean {
  let node: unknown = errors;
  for (const key of path.split('.')) {
    if (!node || typeof node !== 'object') return false;
    node = (node as Record<string, unknown>)[key];
  }
  return !!node;
}

export function SnapSettingsFields({ prefix, idPrefix = 'snap' }: { prefix: string; idPrefix?: string }) {
  const { register, control, formState } = useFormContext();
  const path = (name: string) => (prefix ? `${prefix}.${name}` : name);
  const message = (name: string) => (errorAt(formState.errors, path(name)) ? settingsMessages[name] : undefined);
  const targetKind = useWatch({ control, name: path('target.kind') }) as string | undefined;
  const groupError = message('target.group');

  return (
    <div className="grid gap-x-6 gap-y-5 sm:grid-cols-2">
      <TextField
        id={`${idPrefix}-tolerance`}
        label="Tolerance"
        suffix="Å"
        inputMode="decimal"
        hint="Largest distance allowed between an atom’s image and its partner. Default 0.01 Å."
        error={message('tolerance')}
        {...register(path('tolerance'), { setValueAs: toNumber })}
      />
      <TextField
        id={`${idPrefix}-budget`}
        label="Displacement budget"
        suffix="Å"
        inputMode="decimal"
        hint="A structure whose atoms move farther than this when snapped is flagged over budget."
        error={message('displacementBudget')}
        {...register(path('displacementBudget'), { setValueAs: toNumber })}
      />

      <fieldset className="flex flex-col gap-2 sm:col-span-2">
        <legend className="mb-1 text-sm font-medium text-ink">Snap to</legend>
        <Choice id={`${idPrefix}-target-perceived`} value="perceived" {...register(path('target.kind'))}>
          The perceived group <span className="text-ink-soft">— the group found at this tolerance</span>
        </Choice>
        <Choice id={`${idPrefix}-target-computational`} value="computational" {...register(path('target.kind'))}>
          The computational subgroup <span className="text-ink-soft">— the largest subgroup among D2h and its subgroups</span>
        </Choice>
        <Choice id={`${idPrefix}-target-group`} value="group" {...register(path('target.kind'))}>
          A named group <span className="text-ink-soft">— must be the perceived group or one of its subgroups</span>
        </Choice>
        {targetKind === 'group' && (
          <div className="ml-7 max-w-48">
            <Field label="Group (Schoenflies)" error={groupError} id={`${idPrefix}-target-name`}>
              {(a11y) => <input className={inputClass} placeholder="C2v" autoComplete="off" {...a11y} {...register(path('target.group'))} />}
            </Field>
          </div>
        )}
      </fieldset>

      <fieldset className="flex flex-col gap-2 sm:col-span-2">
        <legend className="mb-1 text-sm font-medium text-ink">Frame</legend>
        <Choice id={`${idPrefix}-frame-standard`} value="standard" {...register(path('frame'))}>
          Standard frame <span className="text-ink-soft">— centre of mass at the origin, principal axis on z</span>
        </Choice>
        <Choice id={`${idPrefix}-frame-input`} value="input" {...register(path('frame'))}>
          Keep the input frame <span className="text-ink-soft">— the applied rotation and translation are reported</span>
        </Choice>
      </fieldset>

      <TextField
        id={`${idPrefix}-charge`}
        label="Default charge"
        inputMode="numeric"
        hint="Used where a file carries none."
        error={message('charge')}
        {...register(path('charge'), { setValueAs: toNumber })}
      />
      <TextField
        id={`${idPrefix}-multiplicity`}
        label="Default multiplicity"
        inputMode="numeric"
        placeholder="lowest consistent"
        hint="Used where a file carries none. Empty: the lowest consistent with the electron count."
        error={message('multiplicity')}
        {...register(path('multiplicity'), { setValueAs: toNullableNumber })}
      />

      <fieldset className="flex flex-col gap-2 sm:col-span-2" aria-describedby={message('outputFormats') ? `${idPrefix}-formats-error` : undefined}>
        <legend className="mb-1 text-sm font-medium text-ink">Output formats</legend>
        <div className="flex flex-wrap gap-x-5 gap-y-2">
          {outputFormats.map((format) => (
            <label key={format} className="flex items-center gap-2 text-sm">
              <input type="checkbox" value={format} className={cx('size-4 accent-lapis', focusRing)} {...register(path('outputFormats'))} />
              {formatLabels[format]}
            </label>
          ))}
        </div>
        {message('outputFormats') && (
          <p id={`${idPrefix}-formats-error`} className="text-xs font-medium text-brick">
            {message('outputFormats')}
          </p>
        )}
      </fieldset>
    </div>
  );
}


const Choice = forwardRef<HTMLInputElement, InputHTMLAttributes<HTMLInputElement> & { children: ReactNode }>(function Choice(
  { children, id, ...rest },
  ref,
) {
  return (
    <label htmlFor={id} className="flex items-start gap-3 text-sm">
      <input ref={ref} id={id} type="radio" className={cx('mt-0.5 size-4 accent-lapis', focusRing)} {...rest} />
      <span>{children}</span>
    </label>
  );
});
