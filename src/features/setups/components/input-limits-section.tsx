import { NEAR_LIMIT_DB } from '@shared/domain/analysis';
import { Notice, Panel } from '@/components/ui/feedback';
import { SelectField, TextField } from '@/components/ui/field';
import { formatDb, formatDbm } from '@/utils/format';
import { useBind, useSetupEditor } from './editor-context';

export const POWER_CAUTION = 'Check every RF input’s maximum safe level before connecting; your lab’s rules come first.';

/** The most each chip input may receive, and what the wiring puts on it (all sources, summed in mW). */
export function InputLimitsSection() {
  const { draft, update, check, preview, instruments } = useSetupEditor();
  const bind = useBind();
  const withLimit = instruments.filter((i) => i.maxSafeInputDbm != null);
  const near = preview?.inputs.some((i) => i.marginDb !== null && i.marginDb < NEAR_LIMIT_DB) ?? false;

  return (
    <Panel title="Input limits">
      <Notice tone={near ? 'fault' : 'caution'}>{POWER_CAUTION}</Notice>
      <div className="mt-4 grid gap-3 sm:grid-cols-[minmax(0,1fr)_minmax(0,2fr)]">
        <SelectField
          label="Fill every input from"
          value=""
          hint="The maximum safe input of the instrument on the chip side, as the inventory records it."
          onChange={(e) => {
            const limit = withLimit.find((i) => i.id === Number(e.target.value))?.maxSafeInputDbm;
            if (limit != null) update((d) => void (d.limitsDbm = d.limitsDbm.map(() => String(limit))));
          }}
        >
          <option value="">Choose an instrument…</option>
          {withLimit.map((i) => (
            <option key={i.id} value={i.id}>
              {i.tag} · {formatDbm(i.maxSafeInputDbm)}
            </option>
          ))}
        </SelectField>
      </div>
      <div className="mt-3 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        {draft.limitsDbm.map((limit, c) => {
          const index = check.inputChannels.indexOf(c);
          const result = preview?.inputs[c];
          const status = result?.marginDb == null ? undefined : result.marginDb < 0 ? 'over the limit' : result.marginDb < NEAR_LIMIT_DB ? 'near the limit' : undefined;
          return (
            <TextField
              key={c}
              label={`Input ${c} maximum safe level (dBm)`}
              inputMode="decimal"
              placeholder="Not known"
              hint={result ? `Receives ${formatDbm(result.totalPowerDbm)}${result.marginDb == null ? '' : `, margin ${formatDb(result.marginDb)}`}${status ? ` (${status})` : ''}` : undefined}
              {...bind(index < 0 ? `analysis.inputs.${c}` : `analysis.inputs.${index}.maxInputDbm`, limit, (d, v) => void (d.limitsDbm[c] = v))}
            />
          );
        })}
      </div>
    </Panel>
  );
}
