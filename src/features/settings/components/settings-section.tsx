import { zodResolver } from '@hookform/resolvers/zod';
import { useMemo } from 'react';
import type { ReactNode } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import type { BusinessSettings, UpdateBusinessInput } from '../../../../shared/api/business';
import { Button } from '../../../components/ui/button';
import { FormField, SelectField, TextAreaField } from '../../../components/ui/form-field';
import { MutationStatus } from '../../../components/ui/mutation-status';
import { Panel } from '../../../components/ui/panel';
import { fieldErrorsOf } from '../../../lib/error-text';
import { useUpdateBusiness } from '../api/mutations';
import { sectionSchema, sectionTexts } from './settings-fields';
import type { SettingField } from './settings-fields';

type SettingsSectionProps = {
  title: string;
  /** What these settings change, in a sentence. */
  about: ReactNode;
  fields: readonly SettingField[];
  settings: BusinessSettings;
  /** Live help under the fields, from what is typed so far (the trip fee's worked examples). */
  preview?: (texts: Partial<Record<string, string>>) => ReactNode;
};

/**
 * One group of settings with its own Save: only the fields changed are sent, and the section says
 * for itself whether that worked, so saving the rates never reports on the profile.
 */
export function SettingsSection({ title, about, fields, settings, preview }: SettingsSectionProps) {
  const schema = useMemo(() => sectionSchema(fields), [fields]);
  const update = useUpdateBusiness();
  const form = useForm<Record<string, string>, unknown, Record<string, unknown>>({
    resolver: zodResolver(schema) as never,
    defaultValues: sectionTexts(fields, settings),
  });
  const { errors, isDirty, dirtyFields } = form.formState;
  const texts = useWatch({ control: form.control });
  const headingId = `settings-${title.toLowerCase().replace(/[^a-z]+/g, '-')}`;

  const submit = form.handleSubmit((values) => {
    const changed = fields.filter((field) => dirtyFields[field.key]).map((field) => field.key);
    if (changed.length === 0) return;
    const body = Object.fromEntries(changed.map((key) => [key, values[key]])) as UpdateBusinessInput;
    update.mutate(body, {
      onSuccess: (saved) => form.reset(sectionTexts(fields, saved)),
      onError: (error) => {
        for (const [path, message] of fieldErrorsOf(error)) {
          if (fields.some((field) => field.key === path)) form.setError(path, { message });
        }
      },
    });
  });

  return (
    <Panel>
      <h2 id={headingId} className="text-xl font-bold">
        {title}
      </h2>
      <p className="mt-1 max-w-prose text-base text-ink-soft">{about}</p>
      <form
        aria-labelledby={headingId}
        className="mt-4 grid gap-4"
        noValidate
        onSubmit={(event) => void submit(event)}
      >
        <div className="grid gap-4 md:grid-cols-2">
          {fields.map((field) => {
            const common = {
              label: field.label,
              hint: field.hint,
              error: errors[field.key]?.message,
              ...form.register(field.key),
            };
            if (field.kind === 'lines' || field.long)
              return <TextAreaField key={field.key} className="md:col-span-2" {...common} />;
            if (field.kind === 'choice') {
              return <SelectField key={field.key} options={field.options ?? []} {...common} />;
            }
            return (
              <FormField
                key={field.key}
                autoComplete="off"
                inputMode={
                  field.inputMode ??
                  (field.kind === 'text' || field.kind === 'optional-text' ? 'text' : 'decimal')
                }
                {...common}
              />
            );
          })}
        </div>
        {preview ? preview(texts) : null}
        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={update.isPending || !isDirty}>
            {update.isPending ? 'Saving…' : `Save ${title.toLowerCase()}`}
          </Button>
          {isDirty ? (
            <Button variant="secondary" disabled={update.isPending} onClick={() => form.reset()}>
              Undo changes
            </Button>
          ) : null}
        </div>
        <MutationStatus
          mutation={update}
          pending={`Saving ${title.toLowerCase()}…`}
          success={isDirty ? 'Saved earlier; the changes above are not saved yet.' : 'Saved.'}
          failure="Not saved."
        />
      </form>
    </Panel>
  );
}
