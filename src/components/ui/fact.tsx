import type { ReactNode } from 'react';

/** One labelled fact in a detail page's <dl>. */
export function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div>
      <dt className="text-caption font-semibold uppercase tracking-wide text-ink-500">{label}</dt>
      <dd className="mt-0.5 text-body text-ink-800">{children}</dd>
    </div>
  );
}
