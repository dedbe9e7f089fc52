import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import type { CapturedMail } from '@shared/schemas/mail';
import { Fact } from '@/components/ui/fact';
import { EmptyState, Loading, Notice, Panel } from '@/components/ui/feedback';
import { ApiError } from '@/lib/api-client';
import { attachmentUrl, messageDetailOptions, messageHtmlUrl } from '../api/get-message';
import { formatBytes, formatLabInstant } from '../utils/mail-format';
import { extractLinks } from '../utils/mail-links';
import { PaperclipIcon } from './paperclip-icon';

type Part = 'html' | 'text';

function PartTabs({ message, part, onChange }: { message: CapturedMail; part: Part; onChange: (part: Part) => void }) {
  const tab = (value: Part, label: string, disabled: boolean) => (
    <button
      type="button"
      role="tab"
      id={`mail-tab-${value}`}
      aria-selected={part === value}
      aria-controls={`mail-part-${value}`}
      disabled={disabled}
      onClick={() => onChange(value)}
      className={`rounded-chip px-3 py-1.5 text-body font-semibold disabled:cursor-not-allowed disabled:text-ink-300 ${
        part === value ? 'bg-ink-800 text-white' : 'text-ink-700 hover:bg-ptfe-100'
      }`}
    >
      {label}
    </button>
  );
  return (
    <div role="tablist" aria-label="Part of the message" className="flex gap-1">
      {tab('html', message.hasHtml ? 'HTML preview' : 'HTML (none)', !message.hasHtml)}
      {tab('text', message.text == null ? 'Plain text (none)' : 'Plain text', message.text == null)}
    </div>
  );
}

function Attachments({ message }: { message: CapturedMail }) {
  if (!message.attachments.length) return null;
  return (
    <div>
      <h3 className="text-caption font-semibold uppercase tracking-wide text-ink-500">Attachments</h3>
      <ul className="mt-1.5 flex flex-wrap gap-2">
        {message.attachments.map((a) => (
          <li key={a.index}>
            <a
              href={attachmentUrl(message.id, a.index)}
              download={a.filename}
              className="inline-flex max-w-full items-center gap-1.5 rounded-chip bg-ptfe-50 px-2.5 py-1.5 text-body font-semibold text-phase-700 ring-1 ring-ink-100 hover:bg-phase-50"
            >
              <PaperclipIcon />
              <span className="break-all">{a.filename}</span>
              <span className="whitespace-nowrap text-caption font-normal text-ink-500">
                {a.contentType.split(';')[0]} · {formatBytes(a.size)}
              </span>
            </a>
          </li>
        ))}
      </ul>
    </div>
  );
}

function Links({ message }: { message: CapturedMail }) {
  const links = extractLinks(message.html, message.text);
  if (!links.length) return null;
  return (
    <div>
      <h3 className="text-caption font-semibold uppercase tracking-wide text-ink-500">Links in this message</h3>
      <p className="text-caption text-ink-500">The preview above does not follow links; open them from here (a new tab).</p>
      <ul className="mt-1.5 space-y-1.5">
        {links.map((link) => (
          <li key={link.url} className="min-w-0">
            <a href={link.url} target="_blank" rel="noopener noreferrer" className="font-semibold text-phase-700 underline underline-offset-4 hover:text-phase-800">
              {link.label ?? link.url}
            </a>
            {link.label ? <div className="break-all font-mono text-caption text-ink-500">{link.url}</div> : null}
          </li>
        ))}
      </ul>
    </div>
  );
}

/** One captured message: its headers, the HTML part in a sandboxed frame or the plain text, links, attachments. */
export function MessageView({ id, timeZone }: { id: number; timeZone: string }) {
  const message = useQuery(messageDetailOptions(id));
  const [chosen, setChosen] = useState<Part | null>(null);

  if (message.isPending) return <Loading label="Opening the message…" />;
  if (message.isError) {
    const gone = message.error instanceof ApiError && message.error.status === 404;
    return gone ? <EmptyState title="This message is no longer here">It was cleared from the capture. Choose another one.</EmptyState> : <Notice tone="fault">{message.error.message}</Notice>;
  }
  const m = message.data;
  const part: Part = chosen ?? (m.hasHtml ? 'html' : 'text');

  return (
    <Panel className="min-w-0 space-y-4">
      <div>
        <h2 className="break-words text-title text-ink-900">{m.subject || '(no subject)'}</h2>
        <dl className="mt-3 grid gap-x-6 gap-y-2 sm:grid-cols-2">
          <Fact label="From">
            <span className="break-words">{m.from || '—'}</span>
          </Fact>
          <Fact label="To">
            <span className="break-words">{m.toHeader || m.to}</span>
            {m.toHeader && m.toHeader.toLowerCase() !== m.to ? <span className="block text-caption text-ink-500">delivered to {m.to}</span> : null}
          </Fact>
          <Fact label="Received">
            <time dateTime={m.receivedAt}>{formatLabInstant(m.receivedAt, timeZone)}</time>
          </Fact>
          <Fact label="Size">{formatBytes(m.sizeBytes)}</Fact>
        </dl>
      </div>
      <Attachments message={m} />
      <div className="space-y-2">
        <PartTabs message={m} part={part} onChange={setChosen} />
        {part === 'html' ? (
          <div role="tabpanel" id="mail-part-html" aria-labelledby="mail-tab-html">
            {/* sandbox without allow-scripts or allow-same-origin: the part is shown, never run; the server's CSP also forbids scripts and requests out. */}
            <iframe
              key={m.id}
              title={`HTML part of “${m.subject}”`}
              src={messageHtmlUrl(m.id)}
              sandbox=""
              referrerPolicy="no-referrer"
              className="block h-[min(70vh,44rem)] min-h-[24rem] w-full rounded-chip bg-white ring-1 ring-ink-200"
            />
          </div>
        ) : (
          <div role="tabpanel" id="mail-part-text" aria-labelledby="mail-tab-text">
            <pre className="max-h-[70vh] overflow-auto whitespace-pre-wrap break-words rounded-chip bg-ptfe-50 p-4 font-mono text-[0.8125rem] leading-relaxed text-ink-800 ring-1 ring-ink-100">
              {m.text}
            </pre>
          </div>
        )}
      </div>
      <Links message={m} />
    </Panel>
  );
}
