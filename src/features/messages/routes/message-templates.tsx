import { useState } from 'react';
import {
  MESSAGE_KIND_LABELS,
  MessageSettingsSchema,
  MessageTemplateUpdateSchema,
  PLACEHOLDER_LABELS,
  PLACEHOLDERS,
  type MessageKind,
  type MessageTemplateDto,
} from '@shared/schemas/messages';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card, PageHeader } from '@/components/card';
import { TextField } from '@/components/field';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useCan } from '@/lib/permissions';
import { useMessageSettings, useMessageTemplates, usePreviewTemplate, useUpdateMessageSettings, useUpdateTemplate } from '../api/messages';

const area =
  'block w-full rounded-md border border-parchment-300 bg-white px-3 py-2 text-sm text-walnut-900 focus:border-amber-500 focus:outline-none focus:ring-2 focus:ring-amber-200';

/** One template: its subject and text, checked as typed, previewed with invented values, saved by the owner. */
function TemplateForm({ template, canEdit }: { template: MessageTemplateDto; canEdit: boolean }) {
  const [subject, setSubject] = useState(template.subject);
  const [body, setBody] = useState(template.body);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const save = useUpdateTemplate(template.kind);
  const preview = usePreviewTemplate(template.kind);
  const id = `template-${template.kind}`;

  const check = () => {
    const parsed = MessageTemplateUpdateSchema.safeParse({ subject, body });
    const found = parsed.success ? {} : zodFieldErrors(parsed.error);
    setErrors(found);
    return parsed.success ? parsed.data : null;
  };
  const onPreview = () => {
    const input = check();
    if (input) preview.mutate(input, { onError: (e) => setErrors(serverFieldErrors(e)) });
  };
  const onSave = () => {
    const input = check();
    if (input) save.mutate(input, { onError: (e) => setErrors(serverFieldErrors(e)) });
  };

  return (
    <Card title={MESSAGE_KIND_LABELS[template.kind]}>
      <p className="mb-3 text-sm text-walnut-600">
        {template.when} {template.edited ? 'Edited by the owner.' : 'The text the product came with.'}
      </p>
      <div className="space-y-3">
        <TextField label="Subject" value={subject} disabled={!canEdit} error={errors.subject} onChange={(e) => setSubject(e.target.value)} />
        <div className="space-y-1">
          <label htmlFor={`${id}-body`} className="block text-sm font-medium text-walnut-800">
            Message
          </label>
          <textarea id={`${id}-body`} rows={6} className={area} value={body} disabled={!canEdit} onChange={(e) => setBody(e.target.value)} aria-invalid={Boolean(errors.body)} />
          {errors.body && (
            <p className="text-sm text-brick-700" role="alert">
              ▲ {errors.body}
            </p>
          )}
        </div>
        <div className="flex flex-wrap gap-2">
          <Button variant="secondary" type="button" onClick={onPreview} busy={preview.isPending}>
            Preview
          </Button>
          {canEdit && (
            <Button type="button" onClick={onSave} busy={save.isPending}>
              Save
            </Button>
          )}
        </div>
        {save.isSuccess && !save.isPending && <Alert tone="info">Saved.</Alert>}
        {preview.data && (
          <div className="rounded-md border border-parchment-200 bg-parchment-50 p-3" data-testid={`${id}-preview`}>
            <p className="text-sm font-medium text-walnut-900">{preview.data.subject}</p>
            <pre className="mt-2 whitespace-pre-wrap font-sans text-sm text-walnut-800">{preview.data.text}</pre>
          </div>
        )}
      </div>
    </Card>
  );
}

/** When the two quote reminders go. */
function ReminderSettings({ canEdit }: { canEdit: boolean }) {
  const settings = useMessageSettings();
  const update = useUpdateMessageSettings();
  const [draft, setDraft] = useState<{ unansweredAfterDays: string; expiringBeforeDays: string } | null>(null);
  const [errors, setErrors] = useState<Record<string, string>>({});
  if (!settings.data) return null;
  const value = draft ?? { unansweredAfterDays: String(settings.data.unansweredAfterDays), expiringBeforeDays: String(settings.data.expiringBeforeDays) };
  const onSave = () => {
    const parsed = MessageSettingsSchema.safeParse(value);
    if (!parsed.success) return setErrors(zodFieldErrors(parsed.error));
    setErrors({});
    update.mutate(parsed.data, { onError: (e) => setErrors(serverFieldErrors(e)), onSuccess: () => setDraft(null) });
  };
  return (
    <Card title="Quote reminders">
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <TextField
          label="Remind about an unanswered quote after (days)"
          inputMode="numeric"
          value={value.unansweredAfterDays}
          disabled={!canEdit}
          error={errors.unansweredAfterDays}
          hint="Counted from the day the quote was sent; 1 to 60 days."
          onChange={(e) => setDraft({ ...value, unansweredAfterDays: e.target.value })}
        />
        <TextField
          label="Remind before a quote expires (days)"
          inputMode="numeric"
          value={value.expiringBeforeDays}
          disabled={!canEdit}
          error={errors.expiringBeforeDays}
          hint="Before its valid-until day; 1 to 30 days."
          onChange={(e) => setDraft({ ...value, expiringBeforeDays: e.target.value })}
        />
      </div>
      <p className="mt-2 text-xs text-walnut-500">A change applies to quotes sent after it.</p>
      {canEdit && (
        <div className="mt-3">
          <Button type="button" onClick={onSave} busy={update.isPending}>
            Save reminder days
          </Button>
        </div>
      )}
    </Card>
  );
}

/** The owner's message templates, with a preview, and the reminder days. */
export function MessageTemplatesPage() {
  const templates = useMessageTemplates();
  const canEdit = useCan().editMessageTemplates;
  return (
    <>
      <PageHeader
        title="Messages to customers"
        description="The e-mails customers receive after the quote. Greeting, sign-off and the safety note are added to every message."
      />
      <Card title="Placeholders">
        <ul className="grid grid-cols-1 gap-1 text-sm text-walnut-700 sm:grid-cols-2">
          {PLACEHOLDERS.map((p) => (
            <li key={p}>
              <code className="rounded bg-parchment-100 px-1">{`{${p}}`}</code> {PLACEHOLDER_LABELS[p]}
            </li>
          ))}
        </ul>
      </Card>
      <div className="mt-4 space-y-4">
        <ReminderSettings canEdit={canEdit} />
        {templates.isError && <Alert tone="error" title="The templates could not be loaded">{templates.error.message}</Alert>}
        {templates.data?.map((t) => <TemplateForm key={`${t.kind}-${t.updatedAt ?? ''}`} template={t} canEdit={canEdit} />)}
      </div>
    </>
  );
}

export type { MessageKind };
export const Component = MessageTemplatesPage;
