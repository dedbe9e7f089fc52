import { useQuery } from '@tanstack/react-query';
import { roleLabels, type Role } from '@shared/domain/roles';
import { BenchCautions } from '@/components/content/bench-cautions';
import { Panel } from '@/components/ui/feedback';
import { meOptions } from '@/features/auth/api/auth.queries';
import { labInfoOptions } from '@/features/lab/api/lab.queries';

const roleCan: Record<Role, string[]> = {
  visitor: ['Read the bench calendar: which instrument is taken when.', 'Read setup records and what their wiring emulates.'],
  researcher: [
    'Everything a visitor can do.',
    'Book instruments for your measurements and hand the bench over to the next booker.',
    'Record your own setups: cables, attenuators, sources and the chip’s delay settings.',
  ],
  manager: [
    'Everything a researcher can do.',
    'Create accounts, change roles and deactivate people (People page).',
    'Keep instruments, cables, calibration dates and qualifications in order.',
  ],
};

export function OverviewRoute() {
  const me = useQuery(meOptions());
  const lab = useQuery(labInfoOptions());
  const user = me.data;
  if (!user) return null;
  const firstName = user.name.split(' ')[0];
  return (
    <div className="space-y-6">
      <div>
        <p className="text-caption font-semibold uppercase tracking-widest text-copper-600">{lab.data?.name ?? 'Skewbench'}</p>
        <h1 className="mt-1 text-display text-ink-900">Good to see you, {firstName}</h1>
        {lab.data ? (
          <p className="mt-1 text-body text-ink-500">
            Times in Skewbench are shown in the lab’s time zone, {lab.data.timeZone}.
          </p>
        ) : null}
      </div>
      <div className="grid gap-6 md:grid-cols-[1fr_1.3fr]">
        <Panel title={`Signed in as ${roleLabels[user.role].toLowerCase()}`}>
          <ul className="list-disc space-y-1.5 pl-5 text-body text-ink-700">
            {roleCan[user.role].map((line) => (
              <li key={line}>{line}</li>
            ))}
          </ul>
        </Panel>
        <Panel title="Bench cautions">
          <BenchCautions />
        </Panel>
      </div>
    </div>
  );
}
