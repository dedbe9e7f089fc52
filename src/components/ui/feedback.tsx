import type { ReactNode } from 'react';

export function Panel({ title, children, className = '' }: { title?: ReactNode; children: ReactNode; className?: string }) {
  return (
    <section className={`rounded-panel bg-white p-5 shadow-panel ring-1 ring-ink-100 ${className}`}>
      {title ? <h2 className="mb-3 text-lead font-bold text-ink-800">{title}</h2> : null}
      {children}
    </section>
  );
}

type Tone = 'info' | 'caution' | 'fault' | 'pass';
const tones: Record<Tone, string> = {
  info: 'bg-phase-50 text-phase-800 ring-phase-100',
  caution: 'bg-caution-50 text-caution-700 ring-caution-300',
  fault: 'bg-fault-50 text-fault-700 ring-fault-300',
  pass: 'bg-pass-50 text-pass-700 ring-pass-500/30',
};

/** A message box; `fault` messages are announced to screen readers at once. */
export function Notice({ tone = 'info', children }: { tone?: Tone; children: ReactNode }) {
  return (
    <div role={tone === 'fault' ? 'alert' : 'status'} className={`rounded-chip px-3.5 py-2.5 text-body ring-1 ${tones[tone]}`}>
      {children}
    </div>
  );
}

export function Badge({ tone = 'info', children }: { tone?: Tone | 'muted'; children: ReactNode }) {
  const look = tone === 'muted' ? 'bg-ink-100 text-ink-600' : tones[tone];
  return <span className={`inline-flex items-center rounded-full px-2 py-0.5 text-caption font-semibold ${look}`}>{children}</span>;
}

export function Loading({ label = 'Loading…' }: { label?: string }) {
  return (
    <div role="status" className="flex items-center gap-3 py-8 text-ink-500">
      <span className="h-4 w-4 animate-spin rounded-full border-2 border-ink-200 border-t-copper-500" aria-hidden />
      {label}
    </div>
  );
}

export function EmptyState({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded-panel border border-dashed border-ink-200 px-6 py-10 text-center">
      <p className="font-semibold text-ink-700">{title}</p>
      {children ? <div className="mt-1 text-body text-ink-500">{children}</div> : null}
    </div>
  );
}
