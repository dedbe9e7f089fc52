import { useQuery } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import { instrumentKindLabels, instrumentKinds, type InstrumentKind } from '@shared/schemas/instruments';
import { Loading, Notice } from '@/components/ui/feedback';
import { SelectField } from '@/components/ui/field';
import { useSignedInUser } from '@/features/auth/hooks/use-signed-in-user';
import { BookingCalendar, calendarViews, type CalendarView } from '@/features/bookings/components/booking-calendar';
import type { BookableInstrument } from '@/features/bookings/components/booking-form';
import { instrumentColour } from '@/features/bookings/utils/colours';
import { instrumentListOptions } from '@/features/instruments/api/instruments.queries';
import { labInfoOptions } from '@/features/lab/api/lab.queries';

const ids = (value: string | null) => new Set((value ?? '').split(',').filter(Boolean).map(Number).filter(Number.isInteger));

/** /calendar: who has which instrument when; filters (kind, instruments), view and date live in the URL. */
export function CalendarRoute() {
  const user = useSignedInUser();
  const lab = useQuery(labInfoOptions());
  const instruments = useQuery(instrumentListOptions());
  const [params, setParams] = useSearchParams();
  const kind = (instrumentKinds as readonly string[]).includes(params.get('kind') ?? '') ? (params.get('kind') as InstrumentKind) : undefined;
  const chosen = ids(params.get('instruments'));
  const view = (Object.keys(calendarViews) as CalendarView[]).find((v) => v === params.get('view')) ?? 'week';
  const date = /^\d{4}-\d{2}-\d{2}$/.test(params.get('date') ?? '') ? params.get('date')! : undefined;
  const update = (changes: Record<string, string>) =>
    setParams((prev) => {
      const next = new URLSearchParams(prev);
      for (const [key, value] of Object.entries(changes)) {
        if (value) next.set(key, value);
        else next.delete(key);
      }
      return next;
    }, { replace: true });

  if (lab.isPending || instruments.isPending) return <Loading label="Loading the calendar…" />;
  if (lab.isError) return <Notice tone="fault">{lab.error.message}</Notice>;
  if (instruments.isError) return <Notice tone="fault">{instruments.error.message}</Notice>;

  const ofKind = instruments.data.filter((i) => !kind || i.kind === kind);
  const shown = chosen.size ? ofKind.filter((i) => chosen.has(i.id)) : ofKind;
  const bookable: BookableInstrument[] = instruments.data
    .filter((i) => i.status === 'in-service')
    .map((i) => ({ id: i.id, tag: i.tag, name: i.name, kind: i.kind, note: i.calibration.state === 'overdue' ? 'calibration overdue' : undefined }));
  const toggle = (id: number, on: boolean) => {
    const next = new Set(chosen);
    if (on) next.add(id);
    else next.delete(id);
    update({ instruments: [...next].join(',') });
  };

  return (
    <div className="space-y-5">
      <div>
        <h1 className="text-display text-ink-900">Calendar</h1>
        <p className="mt-1 text-body text-ink-500">
          Who has which instrument when. Times are on the lab’s clock ({lab.data.timeZone}).
          {user.can('researcher') ? ' Drag across a time range to book it; drag your own bookings to move them.' : ''}
        </p>
      </div>
      <div className="grid gap-3 md:grid-cols-[14rem_1fr]">
        <SelectField label="Kind" value={kind ?? ''} onChange={(e) => update({ kind: e.target.value })}>
          <option value="">All kinds</option>
          {instrumentKinds.map((k) => (
            <option key={k} value={k}>
              {instrumentKindLabels[k]}
            </option>
          ))}
        </SelectField>
        <fieldset className="min-w-0">
          <legend className="flex w-full items-center gap-3 text-caption font-semibold uppercase tracking-wide text-ink-600">
            Instruments
            {chosen.size ? (
              <button type="button" className="normal-case text-phase-700 hover:underline" onClick={() => update({ instruments: '' })}>
                Show all
              </button>
            ) : null}
          </legend>
          <div className="mt-1 flex flex-wrap gap-1.5">
            {ofKind.map((i) => (
              <label
                key={i.id}
                title={i.name}
                className={`inline-flex items-center gap-1.5 rounded-full px-2.5 py-1 text-caption font-semibold ring-1 ${chosen.has(i.id) ? 'bg-ink-800 text-white ring-ink-800' : 'bg-white text-ink-700 ring-ink-200 hover:bg-ptfe-100'}`}
              >
                <input type="checkbox" className="h-3.5 w-3.5 accent-copper-600" checked={chosen.has(i.id)} onChange={(e) => toggle(i.id, e.target.checked)} />
                <span aria-hidden className="h-2.5 w-2.5 rounded-sm ring-1 ring-white/70" style={{ backgroundColor: instrumentColour(i.id) }} />
                <span className="font-mono">{i.tag}</span>
              </label>
            ))}
          </div>
        </fieldset>
      </div>
      <BookingCalendar
        timeZone={lab.data.timeZone}
        instrumentIds={kind || chosen.size ? shown.map((i) => i.id) : undefined}
        instruments={bookable}
        canBook={user.can('researcher')}
        isManager={user.can('manager')}
        initialView={view}
        initialDate={date}
        onNavigate={(nextView, nextDate) => {
          if (nextView !== view || nextDate !== date) update({ view: nextView === 'week' ? '' : nextView, date: nextDate });
        }}
      />
    </div>
  );
}
