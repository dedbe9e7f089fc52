import { useEffect, useId, useRef, type ReactNode } from 'react';
import { Button } from './button';

interface DialogProps {
  title: ReactNode;
  /** Called once the dialog has closed (Escape, the Close button, or a backdrop click where allowed). */
  onClose: () => void;
  children: ReactNode;
  /** A click beside the dialog closes it; off for forms, where a stray click would lose what was typed. */
  dismissOnBackdrop?: boolean;
  className?: string;
}

/**
 * A modal in a native <dialog>: the browser keeps focus inside and closes it on Escape. Focus goes back to
 * the element that had it when the dialog opened, also when the parent closes the dialog by unmounting it.
 */
export function Dialog({ title, onClose, children, dismissOnBackdrop = false, className = 'w-[min(40rem,94vw)]' }: DialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  useEffect(() => {
    const dialog = ref.current;
    const opener = document.activeElement instanceof HTMLElement ? document.activeElement : null;
    dialog?.showModal();
    return () => {
      if (dialog?.open) dialog.close();
      if (opener?.isConnected) opener.focus();
    };
  }, []);
  const close = () => ref.current?.close();

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onClose={onClose}
      onClick={(event) => {
        // A click on the backdrop lands on the <dialog> itself, as its content covers the rest.
        if (dismissOnBackdrop && event.target === event.currentTarget) close();
      }}
      className={`m-auto max-h-[94vh] overflow-auto rounded-panel bg-white p-0 shadow-lifted backdrop:bg-ink-900/60 ${className}`}
    >
      <div className="sticky top-0 z-10 flex items-start justify-between gap-4 border-b border-ink-100 bg-white px-5 py-3">
        <h2 id={titleId} className="text-lead font-bold text-ink-800">
          {title}
        </h2>
        <Button variant="quiet" className="!py-1" onClick={close}>
          Close
        </Button>
      </div>
      <div className="px-5 py-4">{children}</div>
    </dialog>
  );
}
