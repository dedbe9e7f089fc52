import type { Dielectric } from '@shared/domain/cable';
import { analyseSetup, type AnalysisDocument, type AnalysisResult, type Segment, type SourceRole } from '@shared/domain/analysis';
import { partToSegment } from '@shared/domain/part-segment';
import { segmentInputSchema } from '@shared/schemas/analysis';
import type { Part } from '@shared/schemas/parts';
import { setupDocumentSchema, type SetupDocument } from '@shared/schemas/setups';

/**
 * The editor's working copy of a setup document. Numbers stay as typed text (so a half-typed "5." or an empty
 * field is kept as the person left it) and frequencies are in GHz; `toDocument` turns it into the API's
 * document, in Hz, which the shared schema then checks. Paths are kept per source and channel, so adding an
 * input or a source adds its paths and renaming a source keeps its wiring.
 */
export type AdHocKind = 'cable' | 'attenuator' | 'adapter' | 'splitter' | 'dc-block' | 'other';
export const adHocKinds: AdHocKind[] = ['cable', 'attenuator', 'adapter', 'splitter', 'dc-block', 'other'];

export interface DraftSegment {
  id: string;
  /** An inventory part (by id; null until one is picked), or an ad-hoc segment with its own values. */
  source: 'part' | 'ad-hoc';
  partId: number | null;
  kind: AdHocKind;
  tag: string;
  lengthMm: string;
  velocityFactor: string;
  dielectric: Dielectric | '';
  measuredDelayPs: string;
  lossDbPerM: string;
  lossRefGhz: string;
  lossDb: string;
  delayPs: string;
}

export interface DraftSource {
  id: string;
  key: string;
  role: SourceRole;
  instrumentId: number | null;
  frequencyGhz: string;
  powerDbm: string;
  modulation: string;
}

export interface Draft {
  title: string;
  elements: number;
  spacingMode: 'mm' | 'half-wavelength';
  spacingMm: string;
  spacingGhz: string;
  sources: DraftSource[];
  /** Source id → one chain of segments per channel, in order from the generator to the chip input. */
  paths: Record<string, DraftSegment[][]>;
  delaysPs: string[];
  gains: string[];
  /** Maximum safe level per chip input, dBm; empty where not known. */
  limitsDbm: string[];
  nullSearch: { maxDelayPs: string; stepPs: string };
  outputs: { id: string; instrumentId: number | null; note: string }[];
  settings: { id: string; instrumentId: number | null; key: string; value: string }[];
  dut: SetupDocument['dut'];
  notes: string;
  /** Not edited here; kept as loaded so a new revision does not drop it. */
  delayCodes: SetupDocument['delayCodes'];
}

let counter = 0;
/** A key for list rendering, stable for the life of the page. */
export const newId = () => `d${++counter}`;

const text = (value: number | null | undefined) => (value == null ? '' : String(value));
const ghz = (hz: number) => String(Number((hz / 1e9).toPrecision(12)));

export function emptySegment(source: DraftSegment['source'] = 'part'): DraftSegment {
  return { id: newId(), source, partId: null, kind: 'cable', tag: '', lengthMm: '', velocityFactor: '', dielectric: 'ptfe', measuredDelayPs: '', lossDbPerM: '', lossRefGhz: '', lossDb: '', delayPs: '' };
}

export function newSource(role: SourceRole, key: string, instrumentId: number | null = null): DraftSource {
  return { id: newId(), key, role, instrumentId, frequencyGhz: '5', powerDbm: '-20', modulation: 'CW' };
}

/**
 * A fresh setup: two inputs half a wavelength apart at 5 GHz, one desired source on `generatorId`, chip delays
 * at zero, the output measured on `outputIds`.
 */
export function newDraft({ title, generatorId, outputIds }: { title: string; generatorId: number | null; outputIds: number[] }): Draft {
  return {
    title,
    elements: 2,
    spacingMode: 'half-wavelength',
    spacingMm: '',
    spacingGhz: '5',
    sources: [newSource('desired', 'desired', generatorId)],
    paths: {},
    delaysPs: ['0', '0'],
    gains: ['1', '1'],
    limitsDbm: ['', ''],
    nullSearch: { maxDelayPs: '200', stepPs: '1' },
    outputs: outputIds.map((instrumentId) => ({ id: newId(), instrumentId, note: '' })),
    settings: [],
    dut: { chip: '', board: '', die: '', supplies: '', notes: '' },
    notes: '',
    delayCodes: null,
  };
}

function segmentToDraft(segment: SetupDocument['analysis']['paths'][number]['segments'][number]): DraftSegment {
  if ('partId' in segment) return { ...emptySegment('part'), partId: segment.partId };
  const s = segment as Segment;
  const draft: DraftSegment = { ...emptySegment('ad-hoc'), kind: s.kind, tag: s.tag ?? '' };
  if (s.kind === 'cable') {
    return {
      ...draft,
      lengthMm: text(s.lengthMm),
      velocityFactor: text(s.velocityFactor),
      dielectric: s.dielectric ?? '',
      measuredDelayPs: text(s.measuredDelayPs),
      lossDbPerM: text(s.lossDbPerM),
      lossRefGhz: s.lossRefHz == null ? '' : ghz(s.lossRefHz),
    };
  }
  return { ...draft, lossDb: text(s.lossDb), delayPs: text(s.delayPs) };
}

/** The editor's copy of a saved document. */
export function draftFromDocument(doc: SetupDocument): Draft {
  const a = doc.analysis;
  const n = a.array.elements;
  const sources = a.sources.map((s) => {
    const generator = doc.generators.find((g) => g.source === s.key);
    return { id: newId(), key: s.key, role: s.role, instrumentId: generator?.instrumentId ?? null, frequencyGhz: ghz(s.frequencyHz), powerDbm: String(s.powerDbm), modulation: generator?.modulation ?? '' };
  });
  const paths: Draft['paths'] = {};
  a.sources.forEach((s, i) => {
    paths[sources[i]!.id] = Array.from({ length: n }, (_, channel) => (a.paths.find((p) => p.source === s.key && p.channel === channel)?.segments ?? []).map(segmentToDraft));
  });
  return {
    title: doc.title,
    elements: n,
    spacingMode: a.array.spacingMm !== undefined ? 'mm' : 'half-wavelength',
    spacingMm: text(a.array.spacingMm),
    spacingGhz: a.array.spacingHalfWavelengthAtHz === undefined ? '' : ghz(a.array.spacingHalfWavelengthAtHz),
    sources,
    paths,
    delaysPs: Array.from({ length: n }, (_, c) => text(a.combiner.delaysPs[c] ?? 0)),
    gains: Array.from({ length: n }, (_, c) => text(a.combiner.gains?.[c] ?? 1)),
    limitsDbm: Array.from({ length: n }, (_, c) => text(a.inputs?.find((i) => i.channel === c)?.maxInputDbm)),
    nullSearch: { maxDelayPs: text(a.nullSearch?.maxDelayPs), stepPs: text(a.nullSearch?.stepPs) },
    outputs: doc.outputs.map((o) => ({ id: newId(), instrumentId: o.instrumentId, note: o.note })),
    settings: doc.settings.map((s) => ({ id: newId(), instrumentId: s.instrumentId, key: s.key, value: s.value })),
    dut: { ...doc.dut },
    notes: doc.notes,
    delayCodes: doc.delayCodes,
  };
}

/** Resize the per-channel lists when the number of inputs changes; new inputs start with empty paths. */
export function setElements(draft: Draft, n: number) {
  const fit = (list: string[], fill: string) => Array.from({ length: n }, (_, c) => list[c] ?? fill);
  draft.elements = n;
  draft.delaysPs = fit(draft.delaysPs, '0');
  draft.gains = fit(draft.gains, '1');
  draft.limitsDbm = fit(draft.limitsDbm, '');
  for (const id of Object.keys(draft.paths)) draft.paths[id] = Array.from({ length: n }, (_, c) => draft.paths[id]![c] ?? []);
}

/** The chain of segments of one source to one channel (empty until the first segment is added). */
export function chainOf(draft: Draft, sourceId: string, channel: number): DraftSegment[] {
  return draft.paths[sourceId]?.[channel] ?? [];
}

/** Same, for changing it: creates the source's per-channel lists on first use. */
export function editableChain(draft: Draft, sourceId: string, channel: number): DraftSegment[] {
  const chains = (draft.paths[sourceId] ??= Array.from({ length: draft.elements }, () => []));
  return (chains[channel] ??= []);
}

/** Where a source's path to a channel sits in the document's `analysis.paths`: sources in order, then channels. */
export const pathIndex = (draft: Draft, sourceIndex: number, channel: number) => sourceIndex * draft.elements + channel;

/** An empty field is a missing number (NaN, which the schema names), anything else Number() of it. */
const required = (value: string) => (value.trim() === '' ? Number.NaN : Number(value));
const optional = (value: string) => (value.trim() === '' ? undefined : Number(value));
const hz = (value: string) => {
  const v = required(value);
  // toPrecision trims binary noise from the GHz → Hz multiplication (5.1 × 1e9 is 5099999999.999999).
  return Number.isFinite(v) ? Number((v * 1e9).toPrecision(12)) : v;
};

function segmentDocument(s: DraftSegment): Record<string, unknown> {
  if (s.source === 'part') return { partId: s.partId ?? Number.NaN };
  const tag = s.tag.trim() ? { tag: s.tag.trim() } : {};
  if (s.kind === 'cable') {
    return {
      kind: 'cable',
      lengthMm: required(s.lengthMm),
      velocityFactor: optional(s.velocityFactor),
      dielectric: s.dielectric || undefined,
      measuredDelayPs: optional(s.measuredDelayPs),
      lossDbPerM: optional(s.lossDbPerM),
      lossRefHz: s.lossRefGhz.trim() ? hz(s.lossRefGhz) : undefined,
      ...tag,
    };
  }
  if (s.kind === 'attenuator') return { kind: 'attenuator', lossDb: required(s.lossDb), delayPs: optional(s.delayPs), ...tag };
  return { kind: s.kind, lossDb: optional(s.lossDb), delayPs: optional(s.delayPs), ...tag };
}

/** The first interferer, whose null the chip-delay search looks for. */
export const firstInterferer = (draft: Draft) => draft.sources.find((s) => s.role === 'interferer') ?? null;

/** The API document of the draft, before validation; `inputChannels[i]` is the channel of `analysis.inputs[i]`. */
export function toDocument(draft: Draft): { document: Record<string, unknown>; inputChannels: number[] } {
  const n = draft.elements;
  const inputChannels = draft.limitsDbm.flatMap((v, c) => (v.trim() ? [c] : []));
  const interferer = firstInterferer(draft);
  const search = draft.nullSearch;
  const analysis = {
    array: draft.spacingMode === 'mm' ? { elements: n, spacingMm: required(draft.spacingMm) } : { elements: n, spacingHalfWavelengthAtHz: hz(draft.spacingGhz) },
    sources: draft.sources.map((s) => ({ key: s.key.trim(), role: s.role, frequencyHz: hz(s.frequencyGhz), powerDbm: required(s.powerDbm) })),
    paths: draft.sources.flatMap((s) => Array.from({ length: n }, (_, channel) => ({ source: s.key.trim(), channel, segments: chainOf(draft, s.id, channel).map(segmentDocument) }))),
    combiner: { delaysPs: draft.delaysPs.map(required), gains: draft.gains.map(required) },
    ...(inputChannels.length ? { inputs: inputChannels.map((channel) => ({ channel, maxInputDbm: required(draft.limitsDbm[channel]!) })) } : {}),
    ...(interferer && (search.maxDelayPs.trim() || search.stepPs.trim())
      ? { nullSearch: { interferer: interferer.key.trim(), maxDelayPs: required(search.maxDelayPs), stepPs: required(search.stepPs) } }
      : {}),
  };
  return {
    inputChannels,
    document: {
      title: draft.title,
      analysis,
      generators: draft.sources.map((s) => ({ source: s.key.trim(), instrumentId: s.instrumentId, modulation: s.modulation })),
      outputs: draft.outputs.map((o) => ({ instrumentId: o.instrumentId ?? Number.NaN, note: o.note })),
      delayCodes: draft.delayCodes,
      dut: draft.dut,
      settings: draft.settings.map((s) => ({ instrumentId: s.instrumentId ?? Number.NaN, key: s.key, value: s.value })),
      notes: draft.notes,
    },
  };
}

export interface DraftCheck {
  /** The validated document, ready to send; null while any field is wrong. */
  document: SetupDocument | null;
  /** Field path (as the API names it, without `document.`) → first message. */
  errors: Map<string, string>;
  /** The analysis document with every inventory part resolved, when the analysis part is valid. */
  analysisInput: AnalysisDocument | null;
  /** `analysis.inputs[i]` ↔ channel, to put a limit's message on its field. */
  inputChannels: number[];
}

const segmentPath = /^analysis\.paths\.(\d+)\.segments\.(\d+)$/;

/**
 * Check the draft with the shared schema. Two messages are made more precise than the schema's union can be:
 * a segment names the field of its own kind that is wrong, and an inventory segment says that no part (or a
 * part no longer in the inventory) is picked.
 */
export function checkDraft(draft: Draft, partsById: Map<number, Part>): DraftCheck {
  const { document, inputChannels } = toDocument(draft);
  const errors = new Map<string, string>();
  const add = (path: string, message: string) => {
    if (!errors.has(path)) errors.set(path, message);
  };
  const segmentAt = (k: number, j: number) => {
    const source = draft.sources[Math.floor(k / draft.elements)];
    return source ? chainOf(draft, source.id, k % draft.elements)[j] : undefined;
  };

  // Inventory parts the list does not know: the server would refuse them, and the preview cannot resolve them.
  draft.sources.forEach((s, i) => {
    for (let c = 0; c < draft.elements; c++) {
      chainOf(draft, s.id, c).forEach((seg, j) => {
        const at = `analysis.paths.${pathIndex(draft, i, c)}.segments.${j}`;
        if (seg.source === 'part' && seg.partId === null) add(`${at}.partId`, 'Choose a part from the inventory, or make it an ad-hoc segment');
        else if (seg.source === 'part' && !partsById.has(seg.partId!)) add(`${at}.partId`, `Part #${seg.partId} is not in the inventory`);
      });
    }
  });

  const parsed = setupDocumentSchema.safeParse(document);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const path = issue.path.map(String).join('.');
      const match = segmentPath.exec(path);
      if (issue.code === 'invalid_union' && match) {
        const seg = segmentAt(Number(match[1]), Number(match[2]));
        if (seg?.source === 'part') continue; // named above
        const option = seg?.kind === 'cable' ? 1 : seg?.kind === 'attenuator' ? 2 : 3;
        const own = segmentInputSchema.options[option].safeParse(segmentDocument(seg ?? emptySegment('ad-hoc')));
        if (!own.success) {
          for (const sub of own.error.issues) add([path, ...sub.path.map(String)].join('.'), sub.message);
          continue;
        }
      }
      if (/^outputs\.\d+\.instrumentId$/.test(path)) add(path, 'Choose the measuring instrument');
      else if (/^settings\.\d+\.instrumentId$/.test(path)) add(path, 'Choose the instrument');
      else add(path, issue.message);
    }
  }

  const valid = parsed.success && errors.size === 0 ? parsed.data : null;
  let analysisInput: AnalysisDocument | null = null;
  if (parsed.success && ![...errors.keys()].some((p) => p.startsWith('analysis.'))) {
    const a = parsed.data.analysis;
    analysisInput = {
      ...a,
      paths: a.paths.map((p) => ({ ...p, segments: p.segments.map((s) => ('partId' in s ? partToSegment(partsById.get(s.partId)!) : (s as Segment))) })),
    };
  }
  return { document: valid, errors, analysisInput, inputChannels };
}

/** The live preview: the shared engine on the resolved draft (the server recomputes and stores its own). */
export function previewAnalysis(input: AnalysisDocument | null): AnalysisResult | null {
  return input ? analyseSetup(input) : null;
}

/** Where a field path is, in words, for the list of problems beside the save button. */
export function describePath(path: string, draft: Draft, inputChannels: number[]): string {
  const parts = path.split('.');
  const n = draft.elements;
  if (parts[0] === 'analysis' && parts[1] === 'paths' && parts[2] !== undefined) {
    const k = Number(parts[2]);
    const source = draft.sources[Math.floor(k / n)];
    const where = `${source?.key || 'source'} → input ${k % n}`;
    return parts[3] === 'segments' && parts[4] !== undefined ? `${where}, segment ${Number(parts[4]) + 1}` : where;
  }
  if (parts[0] === 'analysis' && parts[1] === 'sources') return parts[2] === undefined ? 'Sources' : `Source ${Number(parts[2]) + 1}`;
  if (parts[0] === 'analysis' && parts[1] === 'array') return 'Array under test';
  if (parts[0] === 'analysis' && parts[1] === 'combiner') return parts[3] === undefined ? 'Combiner' : `Combiner, input ${parts[3]}`;
  if (parts[0] === 'analysis' && parts[1] === 'inputs') return parts[2] === undefined ? 'Input limits' : `Input ${inputChannels[Number(parts[2])] ?? parts[2]} limit`;
  if (parts[0] === 'analysis' && parts[1] === 'nullSearch') return 'Null search';
  if (parts[0] === 'generators') return `Source ${Number(parts[1]) + 1}`;
  if (parts[0] === 'outputs') return `Measuring instrument ${Number(parts[1]) + 1}`;
  if (parts[0] === 'settings') return `Setting ${Number(parts[1]) + 1}`;
  if (parts[0] === 'dut') return 'Device under test';
  return { title: 'Title', notes: 'Notes' }[parts[0] ?? ''] ?? 'Setup';
}
