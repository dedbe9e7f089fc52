import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import {
  instrumentDefaults,
  instrumentInputSchema,
  instrumentKindLabels,
  instrumentKinds,
  instrumentStatusLabels,
  instrumentStatuses,
  type Instrument,
  type InstrumentInput,
} from '@shared/schemas/instruments';
import { Button } from '@/components/ui/button';
import { Notice, Panel } from '@/components/ui/feedback';
import { CheckboxField, SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { formatHz, numberOrNull } from '@/utils/format';
import { useSaveInstrument } from '../api/instruments.mutations';

const fields = Object.keys(instrumentInputSchema.in.shape) as (keyof InstrumentInput)[];
const dateOrNull = (v: unknown) => (v === '' || v == null ? null : String(v));

function startValues(instrument?: Instrument): InstrumentInput {
  if (!instrument) return { tag: '', name: '', kind: 'signal-generator', ...instrumentDefaults };
  return Object.fromEntries(fields.map((f) => [f, instrument[f]])) as InstrumentInput;
}

/** Create or edit an instrument (managers). */
export function InstrumentForm({ instrument, onSaved }: { instrument?: Instrument; onSaved: (saved: Instrument) => void }) {
  const save = useSaveInstrument(instrument?.id);
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, formState, setError, watch } = useForm({
    resolver: zodResolver(instrumentInputSchema),
    defaultValues: startValues(instrument),
  });
  const e = formState.errors;
  const num = (name: keyof InstrumentInput) => register(name, { setValueAs: numberOrNull });
  const [minHz, maxHz] = watch(['minFrequencyHz', 'maxFrequencyHz']);

  const submit = handleSubmit((values) => {
    setBanner(null);
    save.mutate(values, {
      onSuccess: ({ instrument: saved }) => onSaved(saved),
      onError: (error) => {
        if (!applyServerFieldErrors(error, setError, fields)) setBanner(error.message);
      },
    });
  });

  const hzHint = (hz: unknown) => (typeof hz === 'number' && Number.isFinite(hz) ? `= ${formatHz(hz)}` : 'Hz; 6e9 is 6 GHz');

  return (
    <form onSubmit={submit} noValidate aria-label={instrument ? `Edit ${instrument.tag}` : 'New instrument'} className="space-y-5">
      {banner ? <Notice tone="fault">{banner}</Notice> : null}
      <Panel title="Identity">
        <div className="grid gap-4 md:grid-cols-3">
          <TextField label="Asset tag" placeholder="PS-3" error={e.tag?.message} {...register('tag')} />
          <div className="md:col-span-2">
            <TextField label="Name and model" error={e.name?.message} {...register('name')} />
          </div>
          <SelectField label="Kind" error={e.kind?.message} {...register('kind')}>
            {instrumentKinds.map((k) => <option key={k} value={k}>{instrumentKindLabels[k]}</option>)}
          </SelectField>
          <TextField label="Location (room / bench)" error={e.location?.message} {...register('location')} />
          <SelectField label="Status" error={e.status?.message} {...register('status')}>
            {instrumentStatuses.map((s) => <option key={s} value={s}>{instrumentStatusLabels[s]}</option>)}
          </SelectField>
        </div>
      </Panel>
      <Panel title="RF and calibration">
        <div className="grid gap-4 md:grid-cols-4">
          <TextField label="Calibration due" type="date" error={e.calibrationDueOn?.message} {...register('calibrationDueOn', { setValueAs: dateOrNull })} />
          <TextField label="Lowest frequency (Hz)" inputMode="decimal" hint={hzHint(minHz)} error={e.minFrequencyHz?.message} {...num('minFrequencyHz')} />
          <TextField label="Highest frequency (Hz)" inputMode="decimal" hint={hzHint(maxHz)} error={e.maxFrequencyHz?.message} {...num('maxFrequencyHz')} />
          <TextField
            label="Max safe RF input (dBm)"
            inputMode="decimal"
            hint="Damage level of its RF input; leave empty for sources and supplies."
            error={e.maxSafeInputDbm?.message}
            {...num('maxSafeInputDbm')}
          />
        </div>
      </Panel>
      <Panel title="Booking rules">
        <div className="grid gap-4 md:grid-cols-3">
          <TextField label="Longest booking (hours)" inputMode="decimal" hint="Empty for no limit." error={e.maxBookingHours?.message} {...num('maxBookingHours')} />
          <TextField label="Minimum gap between bookings (minutes)" inputMode="numeric" error={e.minGapMinutes?.message} {...num('minGapMinutes')} />
          <TextField label="Booking opens (days ahead)" inputMode="numeric" error={e.advanceDays?.message} {...num('advanceDays')} />
        </div>
        <CheckboxField label="Qualification needed to book" hint="Only people a manager has marked as qualified may book it." {...register('qualificationRequired')} />
      </Panel>
      <Panel>
        <TextAreaField label="Notes" error={e.notes?.message} {...register('notes')} />
      </Panel>
      <div className="flex gap-3">
        <Button type="submit" disabled={save.isPending}>{save.isPending ? 'Saving…' : instrument ? 'Save changes' : 'Add instrument'}</Button>
      </div>
    </form>
  );
}
