import { useId, useState } from 'react';
import { exportTemplateCreateSchema, TEMPLATE_BODY_MAX } from '@shared/contracts/api';
import { describeTemplateProblems, TEMPLATE_PLACEHOLDERS, validateTemplate } from '@shared/formats';
import { Button } from '@/components/ui/button';
import { inputClass, TextField } from '@/components/ui/field';
import { InlineError } from '@/components/ui/states';
import { cx } from '@/lib/cx';
import type { TemplateValues } from '../api/save-template';

type Errors = Partial<Record<keyof TemplateValues, string>>;

/** The first message per field from the shared schema, without its `field:` prefix. */
function fieldErrors(values: TemplateValues): Errors {
  const parsed = exportTemplateCreateSchema.safeParse(values);
  if (parsed.success) return {};
  const errors: Errors = {};
  for (const issue of parsed.error.issues) {
    const key = issue.path[0] as keyof TemplateValues;
    const message = issue.message.replace(/^\w+: /, '');
    if (key && !errors[key]) errors[key] = message[0].toUpperCase() + message.slice(1);
  }
  return errors;
}

const EXAMPLE = ['! deck for {{name}} ({{formula}})', 'symmetry {{subgroup}}', 'charge {{charge}} multiplicity {{multiplicity}}', 'geometry', '{{geometry}}', 'end', ''].join('\n');

/**
 * Create or edit an export template: name, file extension and the deck with placeholders. Unknown
 * placeholders are reported while typing (the server refuses them too); the other fields are
 * checked with the shared contract on submit.
 */
export function TemplateForm({
  initial,
  onSubmit,
  onCancel,
  submitting = false,
  submitError,
}: {
  initial?: TemplateValues;
  onSubmit: (values: TemplateValues) => void;
  onCancel?: () => void;
  submitting?: boolean;
  submitError?: string | null;
}) {
  const [values, setValues] = useState<TemplateValues>(initial ?? { name: '', fileExtension: 'inp', body: '' });
  const [errors, setErrors] = useState<Errors>({});
  const bodyId = useId();
  const unknown = validateTemplate(values.body);
  const bodyError = unknown.length > 0 ? describeTemplateProblems(unknown) : errors.body;
  const set = (key: keyof TemplateValues) => (e: { target: { value: string } }) => {
    setValues((v) => ({ ...v, [key]: e.target.value }));
    setErrors((old) => ({ ...old, [key]: undefined }));
  };

  return (
    <form
      noValidate
      aria-label={initial ? `Edit template ${initial.name}` : 'New export template'}
      className="flex flex-col gap-4"
      onSubmit={(e) => {
        e.preventDefault();
        const found = fieldErrors(values);
        setErrors(found);
        if (Object.keys(found).length === 0) onSubmit(values);
      }}
    >
      <div className="flex flex-wrap gap-3">
        <TextField label="Name" className="min-w-64 flex-1" placeholder="e.g. frequency job" value={values.name} error={errors.name} onChange={set('name')} />
        <TextField
          label="File extension"
          className="w-40"
          hint="Decks are named <structure>.<extension>"
          value={values.fileExtension}
          error={errors.fileExtension}
          onChange={set('fileExtension')}
        />
      </div>
      <div className="grid gap-4 md:grid-cols-[1fr_18rem]">
        <div className="flex flex-col gap-1">
          <label htmlFor={bodyId} className="text-sm font-medium text-ink">
            Deck
          </label>
          <textarea
            id={bodyId}
            className={cx(inputClass, 'num h-64 py-2 font-mono text-xs leading-relaxed')}
            spellCheck={false}
            maxLength={TEMPLATE_BODY_MAX}
            placeholder={EXAMPLE}
            value={values.body}
            aria-invalid={bodyError ? true : undefined}
            aria-describedby={bodyError ? `${bodyId}-error` : undefined}
            onChange={set('body')}
          />
          {bodyError && (
            <p id={`${bodyId}-error`} role="alert" className="text-xs font-medium text-brick">
              {bodyError[0].toUpperCase() + bodyError.slice(1)}
            </p>
          )}
        </div>
        <div aria-label="Placeholders" role="group" className="rounded-md border border-rule bg-paper p-3 text-xs">
          <p className="mb-2 font-medium text-ink">Placeholders</p>
          <dl className="flex flex-col gap-1.5">
            {Object.entries(TEMPLATE_PLACEHOLDERS).map(([name, note]) => (
              <div key={name}>
                <dt className="num font-mono text-ink">{`{{${name}}}`}</dt>
                <dd className="text-ink-soft">{note}</dd>
              </div>
            ))}
          </dl>
        </div>
      </div>
      {submitError && <InlineError>{submitError}</InlineError>}
      <div className="flex gap-2">
        <Button type="submit" busy={submitting}>
          {initial ? 'Save template' : 'Add template'}
        </Button>
        {onCancel && (
          <Button type="button" variant="quiet" onClick={onCancel}>
            Cancel
          </Button>
        )}
      </div>
    </form>
  );
}
