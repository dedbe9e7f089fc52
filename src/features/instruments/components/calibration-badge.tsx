import type { Instrument } from '@shared/schemas/instruments';
import { Badge } from '@/components/ui/feedback';
import { formatDate } from '@/utils/format';

/** Calibration at a glance: overdue (red), due within 30 days (amber), else the due date. */
export function CalibrationBadge({ instrument }: { instrument: Pick<Instrument, 'calibration' | 'calibrationDueOn'> }) {
  const { state, daysLeft } = instrument.calibration;
  if (state === 'none') return <span className="text-caption text-ink-400">not tracked</span>;
  if (state === 'overdue') return <Badge tone="fault">Calibration overdue by {-daysLeft!} d</Badge>;
  if (state === 'due-soon') return <Badge tone="caution">Calibration due in {daysLeft} d</Badge>;
  return <span className="text-caption text-ink-600">due {formatDate(instrument.calibrationDueOn)}</span>;
}
