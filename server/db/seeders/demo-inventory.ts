import type { InstrumentInput } from '../../../shared/schemas/instruments.js';
import { instrumentInputSchema } from '../../../shared/schemas/instruments.js';
import { partInputSchema, type PartInput } from '../../../shared/schemas/parts.js';
import { createInstrument, grantQualification } from '../../features/instruments/instruments.service.js';
import { createPart } from '../../features/parts/parts.service.js';
import type { SessionUser } from '../../../shared/schemas/people.js';
import type { ImageStore } from '../../lib/uploads.js';
import { seedDemoPhotos } from './demo-photos.js';

/** `today` plus `days`, as YYYY-MM-DD: calibration dates of the demo stay relative to the day it is seeded. */
function plusDays(today: string, days: number): string {
  const d = new Date(`${today}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

/** The demo lab's instruments: invented models with the lab's own asset codes (no real brands). */
function demoInstruments(today: string): InstrumentInput[] {
  const room = 'B214 RF lab';
  return [
    { tag: 'PS-1', name: 'Probe station, 200 mm semi-automatic (KV-PX200)', kind: 'probe-station', location: `${room} / bench 1`, qualificationRequired: true, maxBookingHours: 8, minGapMinutes: 30, advanceDays: 28, notes: 'GSG probes up to 67 GHz on the east arms. Dark box; wrist strap at the left post.' },
    { tag: 'PS-2', name: 'Probe station, 150 mm manual (KV-PM150)', kind: 'probe-station', location: `${room} / bench 2`, qualificationRequired: true, maxBookingHours: 6, minGapMinutes: 15, advanceDays: 28, notes: 'Two RF arms, two DC arms. Microscope lamp takes a minute to settle.' },
    { tag: 'SG-1', name: 'Signal generator, 9 kHz to 20 GHz (KV-SG20)', kind: 'signal-generator', location: `${room} / rack A`, calibrationDueOn: plusDays(today, 210), minFrequencyHz: 9e3, maxFrequencyHz: 20e9, maxBookingHours: 12, advanceDays: 60, notes: 'Reverse-power protection to +30 dBm. Output level −130 to +18 dBm.' },
    { tag: 'SG-2', name: 'Signal generator, 100 kHz to 6 GHz (KV-SG06)', kind: 'signal-generator', location: `${room} / rack A`, calibrationDueOn: plusDays(today, 19), minFrequencyHz: 100e3, maxFrequencyHz: 6e9, maxBookingHours: 12, advanceDays: 60 },
    { tag: 'SG-3', name: 'Vector signal generator, 1 to 44 GHz (KV-VG44)', kind: 'signal-generator', location: `${room} / rack B`, calibrationDueOn: plusDays(today, -9), minFrequencyHz: 1e9, maxFrequencyHz: 44e9, maxBookingHours: 8, minGapMinutes: 15, advanceDays: 45, notes: 'Calibration lapsed: booking needs a manager’s override until it is back.' },
    { tag: 'SA-1', name: 'Spectrum analyzer, 2 Hz to 26.5 GHz (KV-SA26)', kind: 'spectrum-analyzer', location: `${room} / bench 1`, calibrationDueOn: plusDays(today, 122), minFrequencyHz: 2, maxFrequencyHz: 26.5e9, maxSafeInputDbm: 30, maxBookingHours: 12, advanceDays: 60, notes: 'Input damage level +30 dBm CW, 0 V DC (AC coupled above 10 MHz only). Keep the 10 dB pad on while aligning.' },
    { tag: 'SA-2', name: 'Spectrum analyzer, 9 kHz to 7.5 GHz (KV-SA07)', kind: 'spectrum-analyzer', status: 'maintenance', location: `${room} / shelf`, calibrationDueOn: plusDays(today, 64), minFrequencyHz: 9e3, maxFrequencyHz: 7.5e9, maxSafeInputDbm: 20, notes: 'Preamp path noisy; back from service next month.' },
    { tag: 'OS-1', name: 'Real-time oscilloscope, 4 channels, 8 GHz (KV-RT8)', kind: 'oscilloscope', location: `${room} / bench 2`, calibrationDueOn: plusDays(today, 300), maxFrequencyHz: 8e9, maxSafeInputDbm: 20, maxBookingHours: 12, advanceDays: 60, notes: '50 Ω inputs: at most 5 V rms (+27 dBm is the damage level; the lab rule is +20 dBm).' },
    { tag: 'NA-1', name: 'Vector network analyzer, 10 MHz to 50 GHz, 2 ports (KV-NA50)', kind: 'vna', location: `${room} / bench 3`, calibrationDueOn: plusDays(today, 44), minFrequencyHz: 10e6, maxFrequencyHz: 50e9, maxSafeInputDbm: 27, qualificationRequired: true, maxBookingHours: 8, minGapMinutes: 30, advanceDays: 30, notes: 'Torque wrench in the drawer (0.9 N·m for 2.4/2.92/3.5 mm). Recalibrate the ports for every new fixture.' },
    { tag: 'PSU-1', name: 'Triple-output DC supply, 0–30 V (KV-DC3)', kind: 'power-supply', location: `${room} / bench 1`, maxBookingHours: 12 },
    { tag: 'SMU-1', name: 'Source-measure unit, 2 channels (KV-SM2)', kind: 'power-supply', location: `${room} / bench 2`, calibrationDueOn: plusDays(today, 9), maxBookingHours: 12, notes: 'Set the compliance before enabling the output.' },
  ];
}

const ptfe = (tag: string, lengthMm: number, description: string, extra: Partial<PartInput> = {}): PartInput => ({
  tag, kind: 'cable', description, connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'male', lengthMm, dielectric: 'ptfe', velocityFactor: 0.695, lossDbPerM: 1.4, lossRefHz: 6e9, ...extra,
});

/**
 * The solver shelf: 16 SMA male/male PTFE cables whose lengths are 150 mm plus the marks of a sparse ruler
 * (Wichmann's construction with r = 2, s = 5: 0, 1, 2, 5, 10, 15, 26, …, 88, 89, 90), so that the differences
 * between two single cables reach every whole millimetre from 1 to 90 mm, about 4.8 ps apart up to 432 ps at
 * VF 0.695. Five SMA female/female barrels of 31–44 ps join two cables into a chain, which fills the steps
 * in between to under 1 ps; three 2.92 mm male / SMA female adapters stay on precision ports as savers.
 */
const trimSetMarksMm = [0, 1, 2, 5, 10, 15, 26, 37, 48, 59, 70, 76, 82, 88, 89, 90];
const measuredTrim: Record<number, { measuredDelayPs: number; measuredOn: string }> = {
  5: { measuredDelayPs: 769.6, measuredOn: '2026-11-03' },
  12: { measuredDelayPs: 1086.9, measuredOn: '2026-11-03' },
};

function solverShelf(): PartInput[] {
  const cables = trimSetMarksMm.map((mark, i) => {
    const tag = `CB-SMA-${String(i + 1).padStart(2, '0')}`;
    const measured = measuredTrim[i + 1];
    return ptfe(tag, 150 + mark, 'Flexible PTFE cable, 2.6 mm, trim set', {
      lossDbPerM: 1.3,
      ...(measured ? { ...measured, measuredHow: 'Network analyzer NA-1, time-domain gate, connectors included' } : {}),
    });
  });
  const barrel = (tag: string, delayPs: number, lossDb: number): PartInput => ({
    tag, kind: 'adapter', description: 'SMA female–female barrel, trim set', connectorA: 'sma', genderA: 'female', connectorB: 'sma', genderB: 'female', lossDb, delayPs, maxFrequencyHz: 18e9,
  });
  const saver = (tag: string, delayPs: number): PartInput => ({
    tag, kind: 'adapter', description: '2.92 mm male to SMA female adapter', connectorA: '2.92mm', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 0.06, delayPs, maxFrequencyHz: 26.5e9,
    notes: 'Connector saver: leave it on the precision 2.92 mm port and mate SMA cables to it, not to the port.',
  });
  return [
    ...cables,
    barrel('AD-10', 31, 0.03), barrel('AD-11', 34, 0.03), barrel('AD-12', 37, 0.04), barrel('AD-13', 41, 0.04), barrel('AD-14', 44, 0.05),
    saver('AD-20', 36), saver('AD-21', 36), saver('AD-22', 39),
  ];
}

/** The demo lab's cables and passive parts. */
function demoParts(): PartInput[] {
  return [
    ptfe('C-001', 150, 'Flexible PTFE cable, 2.6 mm'),
    ptfe('C-002', 200, 'Flexible PTFE cable, 2.6 mm'),
    ptfe('C-003', 250, 'Flexible PTFE cable, 2.6 mm, matched pair A'),
    ptfe('C-004', 260, 'Flexible PTFE cable, 2.6 mm, matched pair B (+10 mm)'),
    ptfe('C-005', 300, 'Flexible PTFE cable, 2.6 mm'),
    ptfe('C-006', 350, 'Flexible PTFE cable, 2.6 mm'),
    ptfe('C-007', 500, 'Flexible PTFE cable, 2.6 mm'),
    ptfe('C-008', 500, 'Flexible PTFE cable, 2.6 mm', { status: 'damaged', notes: 'Intermittent near the B end; do not use for phase work.' }),
    ptfe('C-009', 1000, 'Flexible PTFE cable, 2.6 mm'),
    ptfe('C-010', 400, 'Flexible PTFE cable, 2.6 mm, delay line +150 mm vs C-002', { dielectric: 'ptfe', velocityFactor: 0.7 }),
    { tag: 'C-011', kind: 'cable', description: 'Semi-rigid 3.6 mm PTFE, bent for PS-1 east arm', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'male', lengthMm: 180, dielectric: 'ptfe', lossDbPerM: 1.1, lossRefHz: 10e9, measuredDelayPs: 866.4, measuredOn: '2026-10-14', measuredHow: 'Network analyzer NA-1, time-domain gate, ports calibrated with the 3.5 mm kit' },
    { tag: 'C-012', kind: 'cable', description: 'Semi-rigid 3.6 mm PTFE, bent for PS-1 west arm', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'male', lengthMm: 180, dielectric: 'ptfe', lossDbPerM: 1.1, lossRefHz: 10e9, measuredDelayPs: 869.9, measuredOn: '2026-10-14', measuredHow: 'Network analyzer NA-1, time-domain gate, ports calibrated with the 3.5 mm kit' },
    { tag: 'C-013', kind: 'cable', description: 'Semi-rigid 3.6 mm PTFE, straight', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'male', lengthMm: 305, dielectric: 'ptfe' },
    { tag: 'C-014', kind: 'cable', description: 'Semi-rigid 3.6 mm PTFE, straight', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'male', lengthMm: 610, dielectric: 'ptfe' },
    { tag: 'C-020', kind: 'cable', description: 'Solid-PE 5 mm cable, BNC', connectorA: 'bnc', genderA: 'male', connectorB: 'bnc', genderB: 'male', lengthMm: 1000, dielectric: 'solid-pe', velocityFactor: 0.66, lossDbPerM: 0.46, lossRefHz: 1e9 },
    { tag: 'C-021', kind: 'cable', description: 'Solid-PE 5 mm cable, BNC', connectorA: 'bnc', genderA: 'male', connectorB: 'bnc', genderB: 'male', lengthMm: 2000, dielectric: 'solid-pe', velocityFactor: 0.66, lossDbPerM: 0.46, lossRefHz: 1e9 },
    { tag: 'C-022', kind: 'cable', description: 'Solid-PE 2.8 mm cable, SMA to BNC', connectorA: 'sma', genderA: 'male', connectorB: 'bnc', genderB: 'male', lengthMm: 1000, dielectric: 'solid-pe', velocityFactor: 0.66, lossDbPerM: 1.1, lossRefHz: 1e9 },
    { tag: 'C-023', kind: 'cable', description: 'Solid-PE 5 mm cable, N', connectorA: 'n', genderA: 'male', connectorB: 'n', genderB: 'male', lengthMm: 1500, dielectric: 'solid-pe' },
    { tag: 'C-030', kind: 'cable', description: 'Low-loss foam-PE 10 mm cable, N', connectorA: 'n', genderA: 'male', connectorB: 'n', genderB: 'male', lengthMm: 3000, dielectric: 'foam-pe', velocityFactor: 0.85, lossDbPerM: 0.22, lossRefHz: 2.5e9 },
    { tag: 'C-031', kind: 'cable', description: 'Low-loss foam-PE 10 mm cable, N to SMA', connectorA: 'n', genderA: 'male', connectorB: 'sma', genderB: 'male', lengthMm: 1500, dielectric: 'foam-pe', velocityFactor: 0.85, lossDbPerM: 0.22, lossRefHz: 2.5e9 },
    { tag: 'C-040', kind: 'cable', description: 'Phase-stable 2.92 mm test cable', connectorA: '2.92mm', genderA: 'male', connectorB: '2.92mm', genderB: 'male', lengthMm: 600, dielectric: 'other', velocityFactor: 0.76, lossDbPerM: 3.2, lossRefHz: 40e9 },
    { tag: 'C-041', kind: 'cable', description: 'Phase-stable 2.92 mm test cable', connectorA: '2.92mm', genderA: 'male', connectorB: '2.92mm', genderB: 'male', lengthMm: 600, dielectric: 'other', velocityFactor: 0.76, lossDbPerM: 3.2, lossRefHz: 40e9 },
    { tag: 'C-042', kind: 'cable', description: 'Phase-stable 3.5 mm test cable', connectorA: '3.5mm', genderA: 'male', connectorB: '3.5mm', genderB: 'male', lengthMm: 900, dielectric: 'other', velocityFactor: 0.77, lossDbPerM: 2.1, lossRefHz: 26.5e9 },
    { tag: 'C-050', kind: 'cable', description: 'Air-dielectric reference line, 3.5 mm', connectorA: '3.5mm', genderA: 'male', connectorB: '3.5mm', genderB: 'female', lengthMm: 100, dielectric: 'air', notes: 'Verification kit line. Handle with gloves; never torque by the body.' },
    { tag: 'AT-03', kind: 'attenuator', description: 'Fixed attenuator 3 dB, DC–18 GHz', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 3, maxInputDbm: 33, maxFrequencyHz: 18e9, delayPs: 35 },
    { tag: 'AT-06', kind: 'attenuator', description: 'Fixed attenuator 6 dB, DC–18 GHz', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 6, maxInputDbm: 33, maxFrequencyHz: 18e9, delayPs: 35 },
    { tag: 'AT-10A', kind: 'attenuator', description: 'Fixed attenuator 10 dB, DC–18 GHz', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 10, maxInputDbm: 33, maxFrequencyHz: 18e9, delayPs: 38 },
    { tag: 'AT-10B', kind: 'attenuator', description: 'Fixed attenuator 10 dB, DC–18 GHz', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 10, maxInputDbm: 33, maxFrequencyHz: 18e9, delayPs: 38 },
    { tag: 'AT-20A', kind: 'attenuator', description: 'Fixed attenuator 20 dB, DC–18 GHz', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 20, maxInputDbm: 33, maxFrequencyHz: 18e9, delayPs: 40 },
    { tag: 'AT-20B', kind: 'attenuator', description: 'Fixed attenuator 20 dB, DC–18 GHz', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 20, maxInputDbm: 33, maxFrequencyHz: 18e9, delayPs: 40 },
    { tag: 'AT-30', kind: 'attenuator', description: 'Fixed attenuator 30 dB, 25 W, N', connectorA: 'n', genderA: 'male', connectorB: 'n', genderB: 'female', lossDb: 30, maxInputDbm: 44, maxFrequencyHz: 6e9, notes: 'Gets hot above 10 W: keep it on the heat sink.' },
    { tag: 'AT-10K', kind: 'attenuator', description: 'Fixed attenuator 10 dB, DC–40 GHz, 2.92 mm', connectorA: '2.92mm', genderA: 'male', connectorB: '2.92mm', genderB: 'female', lossDb: 10, maxInputDbm: 30, maxFrequencyHz: 40e9, delayPs: 28 },
    { tag: 'SP-01', kind: 'splitter', description: 'Two-way resistive splitter, DC–18 GHz', connectorA: 'sma', genderA: 'female', connectorB: 'sma', genderB: 'female', lossDb: 6, delayPs: 55, maxFrequencyHz: 18e9 },
    { tag: 'SP-02', kind: 'splitter', description: 'Two-way in-phase splitter, 2–8 GHz', connectorA: 'sma', genderA: 'female', connectorB: 'sma', genderB: 'female', lossDb: 3.4, delayPs: 140, minFrequencyHz: 2e9, maxFrequencyHz: 8e9 },
    { tag: 'SP-03', kind: 'splitter', description: 'Four-way in-phase splitter, 2–8 GHz', connectorA: 'sma', genderA: 'female', connectorB: 'sma', genderB: 'female', lossDb: 6.6, delayPs: 210, minFrequencyHz: 2e9, maxFrequencyHz: 8e9 },
    { tag: 'AD-01', kind: 'adapter', description: 'SMA female–female barrel', connectorA: 'sma', genderA: 'female', connectorB: 'sma', genderB: 'female', lossDb: 0.05, delayPs: 25 },
    { tag: 'AD-02', kind: 'adapter', description: 'SMA right-angle adapter', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 0.1, delayPs: 32 },
    { tag: 'AD-03', kind: 'adapter', description: 'N male to SMA female adapter', connectorA: 'n', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 0.1, delayPs: 48 },
    { tag: 'AD-04', kind: 'adapter', description: '2.92 mm male to SMA female adapter', connectorA: '2.92mm', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 0.1, delayPs: 30 },
    { tag: 'AD-05', kind: 'adapter', description: 'BNC male to SMA female adapter', connectorA: 'bnc', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 0.2, notes: 'Delay not measured.' },
    { tag: 'DB-01', kind: 'dc-block', description: 'Inner/outer DC block, 10 MHz–18 GHz', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 0.3, delayPs: 62, minFrequencyHz: 10e6, maxFrequencyHz: 18e9 },
    { tag: 'DB-02', kind: 'dc-block', description: 'Inner DC block, 10 MHz–18 GHz', connectorA: 'sma', genderA: 'male', connectorB: 'sma', genderB: 'female', lossDb: 0.3, delayPs: 58, minFrequencyHz: 10e6, maxFrequencyHz: 18e9 },
    ...solverShelf(),
    { tag: 'X-01', kind: 'other', description: '50 Ω termination, SMA', connectorA: 'sma', genderA: 'male', connectorB: 'other', genderB: 'female', notes: 'Terminate every unused splitter port.' },
  ];
}

/**
 * Seed instruments, parts, qualifications and a few drawn photos into a database whose users were just seeded.
 * Returns the ids of the seeded items by tag, for later parts of the demo.
 */
export async function seedDemoInventory(
  today: string,
  images: ImageStore,
  people: { manager: SessionUser; researcherIds: number[] },
): Promise<Map<string, number>> {
  const byTag = new Map<string, number>();
  for (const input of demoInstruments(today)) {
    const instrument = await createInstrument(instrumentInputSchema.parse(input), today);
    byTag.set(instrument.tag, instrument.id);
  }
  for (const input of demoParts()) {
    const part = await createPart(partInputSchema.parse(input));
    byTag.set(part.tag, part.id);
  }
  const managerId = people.manager.id;
  // The first researcher is trained on PS-1 and NA-1; the second only on PS-2.
  const [first, second] = people.researcherIds;
  if (first) for (const tag of ['PS-1', 'PS-2', 'NA-1']) await grantQualification(byTag.get(tag)!, first, managerId);
  if (second) await grantQualification(byTag.get('PS-2')!, second, managerId);
  const id = (tag: string) => byTag.get(tag)!;
  await seedDemoPhotos(images, people.manager, { ps1: id('PS-1'), c003: id('C-003'), c004: id('C-004'), sp01: id('SP-01') });
  return byTag;
}
