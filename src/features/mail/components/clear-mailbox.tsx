import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { Notice } from '@/components/ui/feedback';
import { useClearMailbox } from '../api/clear-mailbox';

/** "Clear captured mail", after a confirmation; `onCleared` runs once the messages are gone. */
export function ClearMailbox({ onCleared }: { onCleared: (deleted: number) => void }) {
  const [open, setOpen] = useState(false);
  const clear = useClearMailbox();
  return (
    <>
      <Button variant="secondary" onClick={() => setOpen(true)}>
        Clear captured mail…
      </Button>
      {open ? (
        <Dialog title="Clear captured mail?" onClose={() => setOpen(false)} dismissOnBackdrop className="w-[min(32rem,94vw)]">
          <div className="space-y-4">
            <p className="text-body text-ink-700">
              Every captured message is deleted from this machine, for every recipient, with its attachments. Nothing is sent again, and the outbox keeps
              its record of what was sent.
            </p>
            {clear.error ? <Notice tone="fault">{clear.error.message}</Notice> : null}
            <div className="flex flex-wrap justify-end gap-2">
              <Button variant="quiet" onClick={() => setOpen(false)}>
                Keep the mail
              </Button>
              <Button
                variant="danger"
                disabled={clear.isPending}
                onClick={() =>
                  clear.mutate(undefined, {
                    onSuccess: ({ deleted }) => {
                      setOpen(false);
                      onCleared(deleted);
                    },
                  })
                }
              >
                {clear.isPending ? 'Clearing…' : 'Clear captured mail'}
              </Button>
            </div>
          </div>
        </Dialog>
      ) : null}
    </>
  );
}
