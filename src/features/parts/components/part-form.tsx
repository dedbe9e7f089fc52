import { zodResolver } from '@hookform/resolvers/zod';
import { Fragment, useRef, useState } from 'react';
import { useForm } from 'react-hook-form';
import { dielectricLabels, dielectrics } from '@shared/domain/cable';
import { dbmToWatts } from '@shared/domain/power';
import {
  connectorLabels,
  connectors,
  genderLabels,
  genders,
  partDefaults,
  partInputSchema,
  partKindLabels,
  partKinds,
  partStatusLabels,
  partStatuses,
  typicalGenders,
  type Part,
  type PartInput,
  type PartKind,
} from '@shared/schemas/parts';
import { Button } from '@/components/ui/button';
import { Notice, Panel } from '@/components/ui/feedback';
import { SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { formatHz, numberOrNull } from '@/utils/format';
import { useSavePart } from '../api/parts.mutations';
import { CableDelayPreview } from './cable-delay-preview';

const fields = Object.keys(partInputSchema.in.shape) as (keyof PartInput)[];
const textOrNull = (v: unknown) => (v === '' || v == null ? null : String(v));

function startValues(part?: Part): PartInput {
  if (!part) return { tag: '', kind: 'cable', connectorA: 'sma', connectorB: 'sma', ...typicalGenders.cable, ...partDefaults, dielectric: 'ptfe' };
  const values = Object.fromEntries(fields.map((f) => [f, part[f]])) as PartInput;
  // The API reports the velocity factor in use; only a datasheet value is an input.
  if (part.velocityFactorSource !== 'datasheet') values.velocityFactor = null;
  if (part.kind === 'cable') values.delayPs = null;
  return values;
}

/** Create or edit a cable or passive part (managers); fields follow the kind, and a cable's delay is previewed live. */
export function PartForm({ part, onSaved }: { part?: Part; onSaved: (saved: Part) => void }) {
  const save = useSavePart(part?.id);
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, formState, setError, setValue, watch } = useForm({
    resolver: zodResolver(partInputSchema),
    defaultValues: startValues(part),
    // Fields of other kinds leave the form's values when hidden, so they are not sent or checked.
    shouldUnregister: true,
  });
  const e = formState.errors;
  // A new part starts with its kind's usual genders until the manager chooses one.
  const gendersChosen = useRef(Boolean(part));
  const kindField = register('kind', {
    onChange: (event: { target: { value: PartKind } }) => {
      const typical = typicalGenders[event.target.value];
      if (gendersChosen.current || !typical) return;
      setValue('genderA', typical.genderA);
      setValue('genderB', typical.genderB);
    },
  });
  const genderField = (name: 'genderA' | 'genderB') => register(name, { onChange: () => (gendersChosen.current = true) });
  const num = (name: keyof PartInput) => register(name, { setValueAs: numberOrNull });
  const [kind, lengthMm, dielectric, velocityFactor, measuredDelayPs, lossRefHz, maxInputDbm] = watch([
    'kind', 'lengthMm', 'dielectric', 'velocityFactor', 'measuredDelayPs', 'lossRefHz', 'maxInputDbm',
  ]);

  const submit = handleSubmit((values) => {
    setBanner(null);
    save.mutate(values, {
      onSuccess: ({ part: saved }) => onSaved(saved),
      onError: (error) => {
        if (!applyServerFieldErrors(error, setError, fields)) setBanner(error.message);
      },
    });
  });

  const isCable = kind === 'cable';
  return (
    <form onSubmit={submit} noValidate aria-label={part ? `Edit ${part.tag}` : 'New part'} className="space-y-5">
      {banner ? <Notice tone="fault">{banner}</Notice> : null}
      <Panel title="Part">
        <div className="grid gap-4 md:grid-cols-3">
          <TextField label="Tag" placeholder="C-017" error={e.tag?.message} {...register('tag')} />
          <SelectField label="Kind" error={e.kind?.message} {...kindField}>
            {partKinds.map((k) => <option key={k} value={k}>{partKindLabels[k]}</option>)}
          </SelectField>
          <SelectField label="Status" error={e.status?.message} {...register('status')}>
            {partStatuses.map((s) => <option key={s} value={s}>{partStatusLabels[s]}</option>)}
          </SelectField>
          <div className="md:col-span-3">
            <TextField label="Description" placeholder="Flexible PTFE cable, 2.6 mm" error={e.description?.message} {...register('description')} />
          </div>
          <div className="grid gap-4 sm:grid-cols-2 md:col-span-3 md:grid-cols-4">
            {(['A', 'B'] as const).map((end) => (
              <Fragment key={end}>
                <SelectField label={`Connector, end ${end}`} error={e[`connector${end}`]?.message} {...register(`connector${end}`)}>
                  {connectors.map((c) => <option key={c} value={c}>{connectorLabels[c]}</option>)}
                </SelectField>
                <SelectField label={`Gender, end ${end}`} error={e[`gender${end}`]?.message} {...genderField(`gender${end}`)}>
                  {genders.map((g) => <option key={g} value={g}>{genderLabels[g]}</option>)}
                </SelectField>
              </Fragment>
            ))}
          </div>
        </div>
      </Panel>

      {isCable ? (
        <Panel title="Cable">
          <div className="grid gap-4 md:grid-cols-3">
            <TextField label="Length (mm)" inputMode="decimal" error={e.lengthMm?.message} {...num('lengthMm')} />
            <SelectField label="Dielectric" error={e.dielectric?.message} {...register('dielectric')}>
              {dielectrics.map((d) => <option key={d} value={d}>{dielectricLabels[d]}</option>)}
            </SelectField>
            <TextField
              label="Velocity factor (datasheet)"
              inputMode="decimal"
              hint="Leave empty to use 1/√ε_r of the dielectric; a datasheet value wins."
              error={e.velocityFactor?.message}
              {...num('velocityFactor')}
            />
            <TextField label="Loss (dB/m)" inputMode="decimal" error={e.lossDbPerM?.message} {...num('lossDbPerM')} />
            <TextField
              label="at frequency (Hz)"
              inputMode="decimal"
              hint={typeof lossRefHz === 'number' && Number.isFinite(lossRefHz) ? `= ${formatHz(lossRefHz)}` : 'The datasheet’s reference frequency, e.g. 6e9'}
              error={e.lossRefHz?.message}
              {...num('lossRefHz')}
            />
            <div />
            <TextField label="Measured delay (ps)" inputMode="decimal" hint="Overrides the computed delay." error={e.measuredDelayPs?.message} {...num('measuredDelayPs')} />
            <TextField label="Measured on" type="date" error={e.measuredOn?.message} {...register('measuredOn', { setValueAs: textOrNull })} />
            <TextField label="How it was measured" placeholder="Network analyzer NA-1, time domain" error={e.measuredHow?.message} {...register('measuredHow', { setValueAs: textOrNull })} />
          </div>
          <div className="mt-4">
            <CableDelayPreview lengthMm={lengthMm} dielectric={dielectric} velocityFactor={velocityFactor} measuredDelayPs={measuredDelayPs} />
          </div>
        </Panel>
      ) : (
        <Panel title={partKindLabels[kind ?? 'other']}>
          <div className="grid gap-4 md:grid-cols-3">
            <TextField
              label={kind === 'attenuator' ? 'Nominal attenuation (dB)' : kind === 'splitter' ? 'Loss per branch (dB)' : 'Loss (dB), if known'}
              inputMode="decimal"
              error={e.lossDb?.message}
              {...num('lossDb')}
            />
            <TextField label="Delay (ps), if known" inputMode="decimal" error={e.delayPs?.message} {...num('delayPs')} />
            {kind === 'attenuator' ? (
              <TextField
                label="Maximum input power (dBm)"
                inputMode="decimal"
                hint={typeof maxInputDbm === 'number' && Number.isFinite(maxInputDbm) ? `= ${Number(dbmToWatts(maxInputDbm).toPrecision(3))} W` : '2 W is +33 dBm'}
                error={e.maxInputDbm?.message}
                {...num('maxInputDbm')}
              />
            ) : <div />}
            <TextField label="Lowest frequency (Hz)" inputMode="decimal" error={e.minFrequencyHz?.message} {...num('minFrequencyHz')} />
            <TextField label="Highest frequency (Hz)" inputMode="decimal" error={e.maxFrequencyHz?.message} {...num('maxFrequencyHz')} />
          </div>
        </Panel>
      )}
      <Panel>
        <TextAreaField label="Notes" error={e.notes?.message} {...register('notes')} />
      </Panel>
      <Button type="submit" disabled={save.isPending}>{save.isPending ? 'Saving…' : part ? 'Save changes' : 'Add part'}</Button>
    </form>
  );
}
