import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { EmptyState, Loading, Notice } from '@/components/ui/feedback';
import { labInfoOptions } from '@/features/lab/api/lab.queries';
import { ClearMailbox } from '@/features/mail/components/clear-mailbox';
import { MailboxList } from '@/features/mail/components/mailbox-list';
import { MessageView } from '@/features/mail/components/message-view';
import { OutboxPanel } from '@/features/mail/components/outbox-panel';

/**
 * /mail (lab managers): the local capture of everything Skewbench sends, and the outbox. The recipient filter
 * (`to`) and the open message (`message`) live in the URL.
 */
export function MailRoute() {
  const lab = useQuery(labInfoOptions());
  const [params, setParams] = useSearchParams();
  const [cleared, setCleared] = useState<number | null>(null);
  if (lab.isPending) return <Loading label="Loading mail…" />;
  if (lab.isError) return <Notice tone="fault">{lab.error.message}</Notice>;
  const { timeZone, mail } = lab.data;

  const header = (
    <div className="min-w-[16rem] flex-1">
      <h1 className="text-display text-ink-900">Mail</h1>
      <p className="mt-1 text-body text-ink-500">
        What Skewbench sends: confirmations, handovers, invitations and the rest, from {mail.from}. Times are on the lab’s clock ({timeZone}).
      </p>
    </div>
  );

  if (!mail.captureInUse) {
    return (
      <div className="space-y-6">
        {header}
        <Notice>
          Mail goes to the lab’s relay: SMTP_URL is set, so Skewbench hands every message to that server and keeps no copy here, and there is no mailbox
          to show. The outbox below shows what is waiting for the relay or was refused by it.
        </Notice>
        <OutboxPanel timeZone={timeZone} destination="the lab’s relay" />
      </div>
    );
  }

  const rawId = Number(params.get('message'));
  const selectedId = Number.isInteger(rawId) && rawId > 0 ? rawId : undefined;
  const filter = params.get('to') ?? '';
  const withParams = (changes: Record<string, string | null>) => {
    const next = new URLSearchParams(params);
    for (const [key, value] of Object.entries(changes)) {
      if (value) next.set(key, value);
      else next.delete(key);
    }
    return next;
  };
  const mailHref = (changes: Record<string, string | null>) => {
    const next = withParams(changes);
    return next.size ? `/mail?${next}` : '/mail';
  };
  const messageHref = (id: number) => mailHref({ message: String(id) });

  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-3">
        {header}
        <ClearMailbox
          onCleared={(deleted) => {
            setCleared(deleted);
            setParams(withParams({ message: null }), { replace: true });
          }}
        />
      </div>
      <Notice>
        <strong className="font-semibold">Local capture.</strong> SMTP_URL is not set, so a small mail server inside Skewbench receives all mail it sends
        and keeps it here: nothing leaves this machine and nobody else gets a copy. To deliver to people’s inboxes, point SMTP_URL at the lab’s relay;
        the README’s mail section says how.
      </Notice>
      {cleared !== null ? <Notice tone="pass">Cleared {cleared === 1 ? '1 captured message' : `${cleared} captured messages`}.</Notice> : null}
      <div className="grid items-start gap-5 lg:grid-cols-[minmax(18rem,24rem)_minmax(0,1fr)]">
        <div className={selectedId ? 'hidden lg:block' : ''}>
          <MailboxList
            filter={filter}
            onFilterChange={(value) => setParams(withParams({ to: value }), { replace: true })}
            selectedId={selectedId}
            messageHref={messageHref}
            timeZone={timeZone}
          />
        </div>
        <div className="min-w-0 space-y-3">
          {selectedId ? (
            <>
              <Link to={mailHref({ message: null })} className="inline-block font-semibold text-phase-700 underline underline-offset-4 lg:hidden">
                ← All messages
              </Link>
              <MessageView key={selectedId} id={selectedId} timeZone={timeZone} />
            </>
          ) : (
            <div className="hidden lg:block">
              <EmptyState title="Choose a message">Its headers, HTML preview, plain text, links and attachments show here.</EmptyState>
            </div>
          )}
        </div>
      </div>
      <OutboxPanel timeZone={timeZone} destination="the local capture" />
    </div>
  );
}
