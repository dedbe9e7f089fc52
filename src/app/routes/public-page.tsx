import { useQuery } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { labInfoOptions } from '@/features/lab/api/lab.queries';

/** The frame of the pages used signed out (sign-in, invitation, password reset): the lab beside a narrow column. */
export function PublicPage({ children }: { children: ReactNode }) {
  const lab = useQuery(labInfoOptions());
  return (
    <div className="grid min-h-screen md:grid-cols-[1.1fr_1fr]">
      <aside className="hidden flex-col justify-between bg-ink-900 p-10 text-ptfe-100 md:flex">
        <span className="text-title font-extrabold">
          skew<span className="text-copper-300">bench</span>
        </span>
        <div>
          <svg viewBox="0 0 320 90" className="mb-8 w-full max-w-sm" aria-hidden>
            <path d="M0 45 C20 5 40 5 60 45 S100 85 120 45 S160 5 180 45 S220 85 240 45 S280 5 300 45" fill="none" stroke="#cd7b43" strokeWidth="3" />
            <path d="M20 45 C40 5 60 5 80 45 S120 85 140 45 S180 5 200 45 S240 85 260 45 S300 5 320 45" fill="none" stroke="#7cc3bc" strokeWidth="3" strokeDasharray="5 5" />
          </svg>
          <p className="max-w-md text-lead text-ink-200">
            Book the shared bench, record how every cable was wired, and see which angle of arrival your delays emulate.
          </p>
        </div>
        <p className="text-caption text-ink-400">{lab.data?.name}</p>
      </aside>
      <main className="flex items-center justify-center px-6 py-12">
        <div className="w-full max-w-sm">{children}</div>
      </main>
    </div>
  );
}
