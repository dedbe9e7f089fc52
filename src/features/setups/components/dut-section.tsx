import { Panel } from '@/components/ui/feedback';
import { TextAreaField, TextField } from '@/components/ui/field';
import { useBind, useSetupEditor } from './editor-context';

/** The chip being measured and how it is powered, and free notes on the setup. */
export function DutSection() {
  const { draft } = useSetupEditor();
  const bind = useBind();
  const dut = (field: keyof typeof draft.dut) => bind(`dut.${field}`, draft.dut[field], (d, v) => void (d.dut[field] = v));
  return (
    <Panel title="Device under test">
      <div className="grid gap-3 md:grid-cols-3">
        <TextField label="Chip" maxLength={120} placeholder="TTD4 rev B" {...dut('chip')} />
        <TextField label="Board" maxLength={120} {...dut('board')} />
        <TextField label="Die" maxLength={120} placeholder="Die 7" {...dut('die')} />
        <div className="md:col-span-3">
          <TextAreaField label="Supplies" maxLength={400} rows={2} placeholder="VDD 1.2 V on PSU-1 ch 1, 40 mA compliance" {...dut('supplies')} />
        </div>
        <div className="md:col-span-3">
          <TextAreaField label="Chip notes" maxLength={2000} rows={2} {...dut('notes')} />
        </div>
        <div className="md:col-span-3">
          <TextAreaField label="Setup notes" maxLength={4000} {...bind('notes', draft.notes, (d, v) => void (d.notes = v))} />
        </div>
      </div>
    </Panel>
  );
}
