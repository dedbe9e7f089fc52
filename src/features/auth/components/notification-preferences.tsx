import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { NotificationPreferences } from '@shared/schemas/auth';
import { notificationSettingsSchema, type NotificationSettingsInput } from '@shared/schemas/mail';
import { Button } from '@/components/ui/button';
import { Loading, Notice, Panel } from '@/components/ui/feedback';
import { CheckboxField } from '@/components/ui/field';
import { useUpdateNotificationPreferences } from '../api/auth.mutations';
import { notificationPreferencesOptions } from '../api/auth.queries';

const choicesOf = (preferences: NotificationPreferences): NotificationSettingsInput =>
  Object.fromEntries(preferences.topics.map((t) => [t.key, t.receive]));

/** Which optional e-mails the signed-in person receives; handover and security mail always come. */
export function NotificationPreferencesPanel() {
  const preferences = useQuery(notificationPreferencesOptions());
  const update = useUpdateNotificationPreferences();
  const [saved, setSaved] = useState(false);
  const { register, handleSubmit, formState } = useForm({
    resolver: zodResolver(notificationSettingsSchema),
    // Follows the server's answer: after a save the form is clean again.
    values: preferences.data ? choicesOf(preferences.data) : undefined,
  });

  if (preferences.isPending) return <Loading label="Loading your notification choices…" />;
  if (preferences.isError) return <Notice tone="fault">{preferences.error.message}</Notice>;
  const { topics, alwaysSent } = preferences.data;

  const save = handleSubmit((choices) => {
    setSaved(false);
    update.mutate(choices, { onSuccess: () => setSaved(true) });
  });

  return (
    <Panel title="E-mail notifications">
      <form aria-label="E-mail notifications" className="flex flex-col gap-4" onSubmit={save} onChange={() => setSaved(false)}>
        {topics.length ? (
          <fieldset className="flex flex-col gap-1">
            <legend className="mb-1 text-body text-ink-600">Send me an e-mail about:</legend>
            {topics.map((topic) => (
              <CheckboxField key={topic.key} label={topic.label} hint={topic.description} {...register(topic.key)} />
            ))}
          </fieldset>
        ) : (
          <p className="text-body text-ink-600">Your role receives no optional notifications.</p>
        )}
        <div className="rounded-chip bg-ptfe-100 px-3.5 py-3 ring-1 ring-ptfe-300">
          <p className="text-body font-semibold text-ink-800">Always sent, cannot be switched off</p>
          <ul className="mt-1.5 flex flex-col gap-1 text-body text-ink-600">
            {alwaysSent.map((item) => (
              <li key={item.label}>
                <span className="font-semibold text-ink-700">{item.label}:</span> {item.description}
              </li>
            ))}
          </ul>
        </div>
        {update.error ? <Notice tone="fault">{update.error.message}</Notice> : null}
        {saved && !formState.isDirty ? <Notice tone="pass">Your choices are saved.</Notice> : null}
        {topics.length ? (
          <div>
            <Button type="submit" disabled={!formState.isDirty || update.isPending}>
              {update.isPending ? 'Saving…' : 'Save choices'}
            </Button>
          </div>
        ) : null}
      </form>
    </Panel>
  );
}
