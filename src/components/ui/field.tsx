import { forwardRef, useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes } from 'react';
import { cx } from '@/lib/cx';
import { focusRing } from './focus';

/**
 * A labelled form control with hint and error wired to `aria-describedby` / `aria-invalid`.
 * Use `Field` with a render function to wire your own control, or `TextField` / `SelectField`.
 */
export function Field({
  label,
  hint,
  error,
  className,
  children,
  id: givenId,
}: {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  className?: string;
  id?: string;
  children: (props: { id: string; 'aria-describedby'?: string; 'aria-invalid'?: boolean }) => ReactNode;
}) {
  const autoId = useId();
  const id = givenId ?? autoId;
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(' ') || undefined;
  return (
    <div className={cx('flex flex-col gap-1', className)}>
      <label htmlFor={id} className="text-sm font-medium text-ink">
        {label}
      </label>
      {children({ id, 'aria-describedby': describedBy, 'aria-invalid': error ? true : undefined })}
      {hint && !error && (
        <p id={hintId} className="text-xs text-ink-soft">
          {hint}
        </p>
      )}
      {error && (
        <p id={errorId} className="text-xs font-medium text-brick">
          {error}
        </p>
      )}
    </div>
  );
}

export const inputClass = cx(
  'h-10 w-full rounded-md border border-rule bg-card px-3 text-sm text-ink placeholder:text-ink-faint aria-[invalid=true]:border-brick',
  focusRing,
);

type TextFieldProps = InputHTMLAttributes<HTMLInputElement> & { label: ReactNode; hint?: ReactNode; error?: string; suffix?: ReactNode };

export const TextField = forwardRef<HTMLInputElement, TextFieldProps>(function TextField(
  { label, hint, error, className, suffix, id, ...rest },
  ref,
) {
  return (
    <Field label={label} hint={hint} error={error} className={className} id={id}>
      {(a11y) =>
        suffix ? (
          <div className="relative">
            <input ref={ref} className={cx(inputClass, 'pr-10')} {...a11y} {...rest} />
            <span className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm text-ink-soft">{suffix}</span>
          </div>
        ) : (
          <input ref={ref} className={inputClass} {...a11y} {...rest} />
        )
      }
    </Field>
  );
});

type SelectFieldProps = SelectHTMLAttributes<HTMLSelectElement> & { label: ReactNode; hint?: ReactNode; error?: string };

export const SelectField = forwardRef<HTMLSelectElement, SelectFieldProps>(function SelectField(
  { label, hint, error, className, children, id, ...rest },
  ref,
) {
  return (
    <Field label={label} hint={hint} error={error} className={className} id={id}>
      {(a11y) => (
        <select ref={ref} className={cx(inputClass, 'pr-8')} {...a11y} {...rest}>
          {children}
        </select>
      )}
    </Field>
  );
});
