import { spacingOf } from '@shared/domain/analysis';
import { MAX_ELEMENTS } from '@shared/schemas/analysis';
import { Panel } from '@/components/ui/feedback';
import { SelectField, TextField } from '@/components/ui/field';
import { formatMm } from '@/utils/format';
import { setElements } from '../utils/setup-draft';
import { useBind, useSetupEditor } from './editor-context';

const counts = Array.from({ length: MAX_ELEMENTS - 1 }, (_, i) => i + 2);

/** The virtual array the wiring emulates: how many chip inputs, and how far apart the antennas would be. */
export function ArraySection() {
  const { draft, update, errorFor, check } = useSetupEditor();
  const bind = useBind();
  const halfWave = draft.spacingMode === 'half-wavelength';
  const array = check.analysisInput?.array;
  return (
    <Panel title="Array under test">
      <div className="grid gap-4 md:grid-cols-3">
        <SelectField
          label="Number of inputs"
          value={draft.elements}
          error={errorFor('analysis.array.elements')}
          onChange={(e) => update((d) => setElements(d, Number(e.target.value)), 'analysis.array.elements')}
        >
          {counts.map((n) => (
            <option key={n} value={n}>
              {n}
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Element spacing given as"
          value={draft.spacingMode}
          onChange={(e) => {
            const mode = e.target.value as typeof draft.spacingMode;
            update((d) => {
              d.spacingMode = mode;
              // Switching to millimetres starts from the spacing the frequency gave, so nothing jumps.
              if (mode === 'mm' && !d.spacingMm.trim() && array) d.spacingMm = String(Number(spacingOf(array).toFixed(3)));
            });
          }}
        >
          <option value="half-wavelength">Half a wavelength at a frequency</option>
          <option value="mm">A distance in mm</option>
        </SelectField>
        {halfWave ? (
          <TextField
            label="Half a wavelength at (GHz)"
            inputMode="decimal"
            hint={array ? `d = ${formatMm(spacingOf(array), 3)}` : undefined}
            {...bind('analysis.array.spacingHalfWavelengthAtHz', draft.spacingGhz, (d, v) => void (d.spacingGhz = v))}
          />
        ) : (
          <TextField label="Element spacing (mm)" inputMode="decimal" {...bind('analysis.array.spacingMm', draft.spacingMm, (d, v) => void (d.spacingMm = v))} />
        )}
      </div>
    </Panel>
  );
}
