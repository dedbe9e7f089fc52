import { createContext, useContext, type ChangeEvent } from 'react';
import type { AnalysisResult } from '@shared/domain/analysis';
import type { Instrument } from '@shared/schemas/instruments';
import type { Part } from '@shared/schemas/parts';
import type { Draft, DraftCheck } from '../utils/setup-draft';

export interface SetupEditorContextValue {
  draft: Draft;
  /** Change the draft: `change` edits a copy in place. `path` names the field changed, to drop the server's message on it. */
  update: (change: (draft: Draft) => void, path?: string) => void;
  /** The message to show on a field: the server's, else the schema's once the field was left or a save was tried. */
  errorFor: (path: string) => string | undefined;
  touch: (path: string) => void;
  check: DraftCheck;
  preview: AnalysisResult | null;
  parts: Part[];
  partsById: Map<number, Part>;
  instruments: Instrument[];
  /** Instruments of the setup's booking: another generator or analyzer may be in someone else's hands. */
  booked: ReadonlySet<number>;
  /** The booking the setup is for, and the setup itself once saved: the cable finder works in that time slot. */
  scope: { bookingId: number; setupId?: number };
}

export const SetupEditorContext = createContext<SetupEditorContextValue | null>(null);

export function useSetupEditor(): SetupEditorContextValue {
  const value = useContext(SetupEditorContext);
  if (!value) throw new Error('useSetupEditor is used outside the setup editor');
  return value;
}

type Control = HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement;

/** Props for a text, select or textarea control bound to one value of the draft and its document path. */
export function useBind() {
  const { update, errorFor, touch } = useSetupEditor();
  return (path: string, value: string, set: (draft: Draft, value: string) => void) => ({
    value,
    error: errorFor(path),
    onBlur: () => touch(path),
    onChange: (event: ChangeEvent<Control>) => {
      const next = event.target.value;
      update((draft) => set(draft, next), path);
    },
  });
}
