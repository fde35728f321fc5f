import { useEffect, useRef, useState, type FormEvent } from 'react';
import type { SettingKey } from '#shared/schemas/settings.ts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { Input } from '../../../components/ui/input.tsx';
import { TextArea } from '../../../components/ui/textarea.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { getErrorMessage, isApiError } from '../../../lib/api-client.ts';
import { useSettings } from '../api/get-settings.ts';
import { useUpdateSettings } from '../api/update-settings.ts';
import { parseDraft, settingGroups, toDraft, unitOf, type SettingsDraft } from '../utils/setting-fields.ts';

/** The administrator's settings form: every setting of shared/schemas/settings.ts, grouped. */
export function SettingsForm() {
  const settings = useSettings();
  const update = useUpdateSettings();
  const [draft, setDraft] = useState<SettingsDraft>(() => toDraft(settings));
  const [errors, setErrors] = useState<Partial<Record<SettingKey, string>>>({});
  const [attempt, setAttempt] = useState(0);
  const formRef = useRef<HTMLFormElement>(null);
  const saved = toDraft(settings);
  const dirty = (Object.keys(draft) as SettingKey[]).some((k) => draft[k] !== saved[k]);

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const parsed = parseDraft(draft);
    if (!parsed.ok) {
      setErrors(parsed.errors);
      setAttempt((n) => n + 1);
      return;
    }
    setErrors({});
    update.mutate(parsed.settings, {
      onSuccess: (next) => {
        setDraft(toDraft(next));
        showToast({ tone: 'success', title: 'Settings saved' });
      },
      onError: (err) => {
        if (isApiError(err, 400)) {
          setErrors(err.fieldErrors());
          setAttempt((n) => n + 1);
        }
      },
    });
  };

  // After a refused save, the keyboard lands on the first field to correct.
  useEffect(() => {
    if (attempt > 0) formRef.current?.querySelector<HTMLElement>('[aria-invalid="true"]')?.focus();
  }, [attempt]);

  const errorCount = Object.keys(errors).length;
  return (
    <form ref={formRef} onSubmit={submit} noValidate className="space-y-6">
      {errorCount > 0 && (
        <Alert tone="error" title="The settings were not saved">
          {errorCount === 1 ? 'One field needs a change' : `${errorCount} fields need a change`}: see the messages below.
        </Alert>
      )}
      {update.isError && !isApiError(update.error, 400) && (
        <Alert tone="error" title="The settings were not saved">
          {getErrorMessage(update.error)}
        </Alert>
      )}
      {settingGroups.map((group) => (
        <Card key={group.title} title={group.title} description={group.description}>
          <div className="grid gap-x-6 gap-y-5 md:grid-cols-2">
            {group.fields.map((field) =>
              field.kind === 'emails' ? (
                <TextArea
                  key={field.key}
                  label={field.label}
                  name={field.key}
                  hint={field.hint}
                  error={errors[field.key]}
                  className="md:col-span-2"
                  value={draft[field.key]}
                  onChange={(e) => setDraft((d) => ({ ...d, [field.key]: e.target.value }))}
                />
              ) : (
                <Input
                  key={field.key}
                  label={field.label}
                  name={field.key}
                  type="text"
                  inputMode={field.kind === 'number' ? 'decimal' : undefined}
                  unit={unitOf(field, settings)}
                  hint={field.hint}
                  error={errors[field.key]}
                  value={draft[field.key]}
                  onChange={(e) => setDraft((d) => ({ ...d, [field.key]: e.target.value }))}
                />
              ),
            )}
          </div>
        </Card>
      ))}
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" loading={update.isPending} disabled={!dirty}>
          Save settings
        </Button>
        <Button
          variant="secondary"
          disabled={!dirty || update.isPending}
          onClick={() => {
            setDraft(saved);
            setErrors({});
            update.reset();
          }}
        >
          Undo changes
        </Button>
        <p className="text-sm text-basin-600" aria-live="polite">
          {dirty ? 'You have unsaved changes.' : 'No unsaved changes.'}
        </p>
      </div>
    </form>
  );
}
