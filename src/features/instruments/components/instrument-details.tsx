import { instrumentKindLabels, instrumentStatusLabels, type Instrument } from '@shared/schemas/instruments';
import { Fact } from '@/components/ui/fact';
import { Badge, Notice, Panel } from '@/components/ui/feedback';
import { formatDate, formatDbm, formatRange } from '@/utils/format';
import { CalibrationBadge } from './calibration-badge';

export function InstrumentDetails({ instrument: i }: { instrument: Instrument }) {
  return (
    <div className="space-y-4">
      {i.status !== 'in-service' ? (
        <Notice tone="caution">{i.tag} is {instrumentStatusLabels[i.status].toLowerCase()} and cannot be booked.</Notice>
      ) : null}
      {i.calibration.state === 'overdue' ? (
        <Notice tone="fault">Calibration of {i.tag} is overdue since {formatDate(i.calibrationDueOn)}: measurements with it are not traceable until it is recalibrated.</Notice>
      ) : null}
      {i.maxSafeInputDbm !== null ? (
        <Notice tone="caution">
          Keep the RF input below {formatDbm(i.maxSafeInputDbm)} (and mind any DC limit). Start sources with RF off and at minimum level; add an attenuator
          when in doubt. Your lab’s rules come first.
        </Notice>
      ) : null}
      <Panel>
        <dl className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          <Fact label="Kind">{instrumentKindLabels[i.kind]}</Fact>
          <Fact label="Location">{i.location || '—'}</Fact>
          <Fact label="Status">
            <Badge tone={i.status === 'in-service' ? 'pass' : i.status === 'maintenance' ? 'caution' : 'muted'}>{instrumentStatusLabels[i.status]}</Badge>
          </Fact>
          <Fact label="Calibration"><CalibrationBadge instrument={i} /></Fact>
          <Fact label="Frequency range">{formatRange(i.minFrequencyHz, i.maxFrequencyHz)}</Fact>
          <Fact label="Max safe RF input">{formatDbm(i.maxSafeInputDbm)}</Fact>
          <Fact label="Qualification">{i.qualificationRequired ? 'Needed to book' : 'Not needed'}</Fact>
          <Fact label="Booking rules">
            {i.maxBookingHours ? `at most ${i.maxBookingHours} h` : 'no length limit'}, gap {i.minGapMinutes} min, opens {i.advanceDays} days ahead
          </Fact>
        </dl>
        {i.notes ? <p className="mt-4 whitespace-pre-line border-t border-ink-100 pt-3 text-body text-ink-700">{i.notes}</p> : null}
      </Panel>
    </div>
  );
}
