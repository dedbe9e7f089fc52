import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm, type FieldErrors, type Resolver } from 'react-hook-form';
import { createBookingInputSchema, type Booking, type CreateBookingInput } from '@shared/schemas/bookings';
import { instrumentKindLabels, instrumentKinds, type InstrumentKind } from '@shared/schemas/instruments';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/feedback';
import { CheckboxField, TextAreaField, TextField } from '@/components/ui/field';
import { ApiError } from '@/lib/api-client';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { useCreateBooking, useJoinWaitlist } from '../api/bookings.mutations';
import { bookingRefusal, clashText } from '../utils/booking-text';
import { instrumentColour } from '../utils/colours';
import { formatLabRange, instantToLabInput, labInputToInstant } from '../utils/lab-time';

/** An instrument the form offers; `note` flags what the booker should know (e.g. calibration overdue). */
export interface BookableInstrument {
  id: number;
  tag: string;
  name: string;
  kind: InstrumentKind;
  note?: string;
}

/** The form's own values: start and end as `datetime-local` values on the lab's wall clock. */
interface BookingFormValues {
  instrumentIds: number[];
  startsAt: string;
  endsAt: string;
  purpose: string;
  projectCode: string;
  notes: string;
  maintenance: boolean;
  overrideCalibration: boolean;
}

const serverFields = ['instrumentIds', 'startsAt', 'endsAt', 'purpose', 'projectCode', 'notes'] as const;

/** The API request for the form's values: lab wall clock → UTC instants; options only when chosen. */
function toInput(values: BookingFormValues, timeZone: string) {
  return {
    instrumentIds: values.instrumentIds,
    startsAt: labInputToInstant(values.startsAt, timeZone) ?? '',
    endsAt: labInputToInstant(values.endsAt, timeZone) ?? '',
    purpose: values.purpose,
    projectCode: values.projectCode.trim() || undefined,
    notes: values.notes.trim() || undefined,
    kind: values.maintenance ? ('maintenance' as const) : undefined,
    overrideCalibration: values.overrideCalibration || undefined,
  };
}

const schemaResolver = zodResolver(createBookingInputSchema);

/** The shared schema's messages, on the form's fields; an empty or incomplete date gets a plain message of its own. */
function bookingResolver(timeZone: string): Resolver<BookingFormValues, unknown, CreateBookingInput> {
  return async (values, context, options) => {
    const result = await schemaResolver(toInput(values, timeZone), context, options as never);
    const errors = { ...result.errors } as FieldErrors<BookingFormValues>;
    for (const [name, what] of [['startsAt', 'start'], ['endsAt', 'end']] as const) {
      if (!labInputToInstant(values[name], timeZone)) errors[name] = { type: 'required', message: `Enter the ${what} date and time` };
    }
    return Object.keys(errors).length ? { values: {}, errors } : { values: result.values as CreateBookingInput, errors: {} };
  };
}

interface BookingFormProps {
  instruments: BookableInstrument[];
  timeZone: string;
  /** The slot to start from, as instants (e.g. the range dragged across the calendar). */
  initialRange: { startsAt: string; endsAt: string };
  initialInstrumentIds?: number[];
  /** Managers may block for maintenance and override an overdue calibration. */
  isManager: boolean;
  onBooked: (booking: Booking) => void;
}

/** Book one or more instruments for a slot, with the server's clashes and rule breaks explained. */
export function BookingForm({ instruments, timeZone, initialRange, initialInstrumentIds = [], isManager, onBooked }: BookingFormProps) {
  const create = useCreateBooking();
  const joinWaitlist = useJoinWaitlist();
  const { register, control, handleSubmit, formState, setError, watch } = useForm<BookingFormValues, unknown, CreateBookingInput>({
    resolver: bookingResolver(timeZone),
    defaultValues: {
      instrumentIds: initialInstrumentIds,
      startsAt: instantToLabInput(initialRange.startsAt, timeZone),
      endsAt: instantToLabInput(initialRange.endsAt, timeZone),
      purpose: '',
      projectCode: '',
      notes: '',
      maintenance: false,
      overrideCalibration: false,
    },
  });
  const e = formState.errors;
  const maintenance = watch('maintenance');

  const submit = handleSubmit((input) => {
    joinWaitlist.reset();
    create.mutate(input, {
      onSuccess: ({ booking }) => onBooked(booking),
      onError: (error) => applyServerFieldErrors(error, setError, serverFields),
    });
  });

  const refusal = bookingRefusal(create.error);
  // Field issues of a 400 are shown on their fields; anything else goes in a banner.
  const onFields = create.error instanceof ApiError && create.error.fieldIssues.some((i) => (serverFields as readonly string[]).includes(i.path));
  const asked = create.variables;
  const clashingIds = [...new Set(refusal?.clashes.map((c) => c.instrumentId) ?? [])];
  const tagOf = (id: number) => instruments.find((i) => i.id === id)?.tag ?? `#${id}`;

  const groups = instrumentKinds
    .map((kind) => ({ kind, items: instruments.filter((i) => i.kind === kind) }))
    .filter((group) => group.items.length > 0);

  return (
    <form onSubmit={submit} noValidate aria-label="Book instruments" className="space-y-4">
      <div className="grid gap-5 md:grid-cols-[1fr_1.1fr]">
        <Controller
          control={control}
          name="instrumentIds"
          render={({ field }) => (
            <fieldset aria-describedby={e.instrumentIds ? 'booking-instruments-error' : undefined} className="min-w-0">
              <legend className="text-caption font-semibold uppercase tracking-wide text-ink-600">Instruments</legend>
              <div className="mt-1 max-h-80 space-y-3 overflow-y-auto rounded-chip border border-ink-100 p-2">
                {groups.map((group) => (
                  <div key={group.kind} role="group" aria-label={instrumentKindLabels[group.kind]}>
                    <p className="px-1 text-caption font-semibold text-ink-500">{instrumentKindLabels[group.kind]}</p>
                    {group.items.map((i) => (
                      <label key={i.id} className="flex min-w-0 items-center gap-2 rounded px-1 py-0.5 text-body hover:bg-ptfe-100">
                        <input
                          type="checkbox"
                          className="shrink-0 accent-copper-600"
                          checked={field.value.includes(i.id)}
                          onBlur={field.onBlur}
                          onChange={(event) =>
                            field.onChange(event.target.checked ? [...field.value, i.id] : field.value.filter((id) => id !== i.id))
                          }
                        />
                        <span aria-hidden className="h-3 w-3 shrink-0 rounded-sm" style={{ backgroundColor: instrumentColour(i.id) }} />
                        <span className="shrink-0 font-mono font-semibold">{i.tag}</span>
                        <span className="min-w-0 truncate text-ink-500">{i.name}</span>
                        {i.note ? <span className="shrink-0 text-caption font-semibold text-fault-700">{i.note}</span> : null}
                      </label>
                    ))}
                  </div>
                ))}
              </div>
              {e.instrumentIds ? (
                <p id="booking-instruments-error" role="alert" className="mt-1 text-caption font-semibold text-fault-700">
                  {e.instrumentIds.message}
                </p>
              ) : null}
            </fieldset>
          )}
        />
        <div className="space-y-3">
          <div className="grid gap-3 sm:grid-cols-2">
            <TextField label="Start" type="datetime-local" error={e.startsAt?.message} {...register('startsAt')} />
            <TextField label="End" type="datetime-local" error={e.endsAt?.message} {...register('endsAt')} />
          </div>
          <p className="text-caption text-ink-500">Times are the lab’s clock ({timeZone}).</p>
          <TextField label="Purpose" placeholder="Load-pull of the PA test chip" error={e.purpose?.message} {...register('purpose')} />
          <TextField label="Project code" placeholder="Optional" error={e.projectCode?.message} {...register('projectCode')} />
          <TextAreaField label="Notes" error={e.notes?.message} {...register('notes')} />
          {isManager ? (
            <div className="rounded-chip bg-ptfe-100 px-3 py-2">
              <CheckboxField label="Maintenance block" hint="Blocks the instruments for everyone; booking rules do not apply." {...register('maintenance')} />
              <CheckboxField label="Override overdue calibration" hint="Allows instruments whose calibration has lapsed; the override is recorded." {...register('overrideCalibration')} />
            </div>
          ) : null}
        </div>
      </div>

      {refusal && refusal.clashes.length > 0 ? (
        <div role="alert" className="space-y-2 rounded-chip bg-fault-50 px-3.5 py-2.5 text-body text-fault-700 ring-1 ring-fault-300">
          <p className="font-semibold">That slot is taken:</p>
          <ul className="list-disc space-y-0.5 pl-5" aria-label="Clashing slots">
            {refusal.clashes.map((c) => (
              <li key={`${c.instrumentId}-${c.startsAt}`}>{clashText(c, timeZone)}</li>
            ))}
          </ul>
          {asked && clashingIds.length > 0 ? (
            joinWaitlist.isSuccess ? (
              <p role="status" className="font-semibold text-pass-700">
                You are on the waitlist for {clashingIds.map(tagOf).sort().join(', ')}, {formatLabRange(asked.startsAt, asked.endsAt, timeZone)}. If the slot frees up,
                My bookings shows it as offered.
              </p>
            ) : (
              <div className="flex flex-wrap items-center gap-3">
                <Button
                  variant="secondary"
                  disabled={joinWaitlist.isPending}
                  onClick={() =>
                    joinWaitlist.mutate(clashingIds.map((instrumentId) => ({ instrumentId, startsAt: asked.startsAt, endsAt: asked.endsAt })))
                  }
                >
                  {joinWaitlist.isPending ? 'Joining…' : 'Join the waitlist for this slot'}
                </Button>
                {joinWaitlist.error ? <span className="font-semibold">{joinWaitlist.error.message}</span> : null}
              </div>
            )
          ) : null}
        </div>
      ) : null}
      {refusal && refusal.issues.length > 0 ? (
        <div role="alert" className="rounded-chip bg-fault-50 px-3.5 py-2.5 text-body text-fault-700 ring-1 ring-fault-300">
          <p className="font-semibold">The booking breaks the lab’s booking rules:</p>
          <ul className="mt-1 list-disc space-y-0.5 pl-5" aria-label="Broken rules">
            {refusal.issues.map((issue, index) => (
              <li key={index}>{issue.message}</li>
            ))}
          </ul>
        </div>
      ) : null}
      {refusal && refusal.clashes.length === 0 && refusal.issues.length === 0 ? <Notice tone="fault">{refusal.message}</Notice> : null}
      {create.error && !refusal && !onFields ? <Notice tone="fault">{create.error.message}</Notice> : null}

      <p className="border-l-4 border-caution-500 bg-caution-50 px-3 py-2 text-caption text-caution-700">
        Check each instrument input’s maximum safe level before connecting a source; wear a wrist strap at the probe station; your lab’s rules come
        first.
      </p>
      <Button type="submit" disabled={create.isPending}>
        {create.isPending ? 'Booking…' : maintenance ? 'Block for maintenance' : 'Book'}
      </Button>
    </form>
  );
}

