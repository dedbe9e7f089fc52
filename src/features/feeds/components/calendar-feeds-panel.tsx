import { useQuery } from '@tanstack/react-query';
import { useRef, useState } from 'react';
import { FEED_AHEAD_DAYS, FEED_PAST_DAYS } from '@shared/schemas/feeds';
import { Button } from '@/components/ui/button';
import { Loading, Notice, Panel } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { useCreateFeed, useRevokeFeed, type FeedTarget } from '../api/feeds.mutations';
import { feedListOptions } from '../api/feeds.queries';

/**
 * The secret iCalendar link of the signed-in person's own bookings, or of one instrument's calendar when
 * `instrumentId` is given: create, copy, regenerate, revoke.
 */
export function CalendarFeedsPanel({ instrumentId }: { instrumentId?: number }) {
  const target: FeedTarget = instrumentId === undefined ? { scope: 'person' } : { scope: 'instrument', instrumentId };
  const list = useQuery(feedListOptions());
  const create = useCreateFeed();
  const revoke = useRevokeFeed();
  // The server returns the URL once and keeps only its hash, so the panel holds it until the page is left.
  // It remembers which feed it belongs to, because the router may reuse this panel for another instrument.
  const [shown, setShown] = useState<{ instrumentId?: number; url: string } | null>(null);
  const [confirming, setConfirming] = useState(false);
  const [copied, setCopied] = useState<'copied' | 'select' | null>(null);
  const input = useRef<HTMLInputElement>(null);

  const feed = list.data?.find((f) => f.scope === target.scope && f.instrumentId === (instrumentId ?? null));
  const url = feed && shown && shown.instrumentId === instrumentId ? shown.url : null;
  const what = instrumentId === undefined ? 'Your own bookings' : 'Every booking and maintenance block of this instrument';

  const makeLink = () =>
    create.mutate(target, {
      onSuccess: ({ feed: made }) => {
        if (made.url) setShown({ instrumentId, url: made.url });
        setConfirming(false);
        setCopied(null);
      },
    });

  const revokeLink = () =>
    revoke.mutate(target, {
      onSuccess: () => {
        setShown(null);
        setConfirming(false);
      },
    });

  async function copy() {
    if (!url) return;
    try {
      await navigator.clipboard.writeText(url);
      setCopied('copied');
    } catch {
      // The clipboard API exists only on https and localhost; on a plain-http lab server the person copies by hand.
      input.current?.select();
      setCopied('select');
    }
  }

  return (
    <Panel title="Calendar feed">
      <p className="text-body text-ink-600">
        {what}, from {FEED_PAST_DAYS} days back to {FEED_AHEAD_DAYS} days ahead, in any calendar app that subscribes to a URL (iCalendar).
        Anyone who has the link can read the feed: keep it to yourself.
      </p>
      {list.isPending ? (
        <Loading />
      ) : list.isError ? (
        <div className="mt-3">
          <Notice tone="fault">{list.error.message}</Notice>
        </div>
      ) : (
        <div className="mt-3 space-y-3">
          {url ? (
            <>
              <div className="flex items-end gap-2">
                <div className="flex-1">
                  <TextField
                    ref={input}
                    label="Feed link"
                    readOnly
                    value={url}
                    onFocus={(e) => e.currentTarget.select()}
                    hint="Shown only now. Paste it into your calendar app’s “subscribe to calendar” dialog."
                  />
                </div>
                <Button variant="secondary" onClick={copy}>
                  Copy
                </Button>
              </div>
              {copied === 'copied' ? <Notice tone="pass">Copied to the clipboard.</Notice> : null}
              {copied === 'select' ? <Notice>The link is selected: press Ctrl+C (⌘C on a Mac) to copy it.</Notice> : null}
            </>
          ) : feed ? (
            <p className="text-body text-ink-700">
              A feed link exists since {new Date(feed.createdAt).toLocaleDateString()}. It is shown only when it is made; regenerate it to see a new one.
            </p>
          ) : (
            <p className="text-body text-ink-700">No feed link yet.</p>
          )}

          {confirming ? (
            <Notice tone="caution">
              A new link replaces the current one, which stops working at once in every calendar that subscribes to it.
              <div className="mt-2 flex flex-wrap gap-2">
                <Button onClick={makeLink} disabled={create.isPending}>
                  Regenerate link
                </Button>
                <Button variant="quiet" onClick={() => setConfirming(false)}>
                  Keep the current link
                </Button>
              </div>
            </Notice>
          ) : (
            <div className="flex flex-wrap gap-2">
              {feed ? (
                <Button variant="secondary" onClick={() => setConfirming(true)}>
                  Regenerate link
                </Button>
              ) : (
                <Button onClick={makeLink} disabled={create.isPending}>
                  Create feed link
                </Button>
              )}
              {feed ? (
                <Button variant="quiet" onClick={revokeLink} disabled={revoke.isPending}>
                  Revoke
                </Button>
              ) : null}
            </div>
          )}
          {create.error ? <Notice tone="fault">{create.error.message}</Notice> : null}
          {revoke.error ? <Notice tone="fault">{revoke.error.message}</Notice> : null}
        </div>
      )}
    </Panel>
  );
}
