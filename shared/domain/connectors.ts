/**
 * RF connectors: their types, their genders, and which two ends mate.
 *
 * A two-port part (cable, pad, adapter, DC block) has an end A and an end B, each a connector type with a
 * gender. Male is the plug (centre pin, coupling nut), female the jack (centre socket). Two ends mate when
 * their genders are opposite and their types are compatible. A passive two-port can be turned round, so
 * whoever chains parts may try either end first.
 */

export const connectors = ['sma', '2.92mm', '3.5mm', 'n', 'bnc', 'other'] as const;
export type Connector = (typeof connectors)[number];
export const connectorLabels: Record<Connector, string> = {
  sma: 'SMA',
  '2.92mm': '2.92 mm',
  '3.5mm': '3.5 mm',
  n: 'N',
  bnc: 'BNC',
  other: 'Other',
};

export const genders = ['male', 'female'] as const;
export type Gender = (typeof genders)[number];
/** Long labels, for forms and detail pages. */
export const genderLabels: Record<Gender, string> = { male: 'male (plug)', female: 'female (jack)' };
/** Short labels, for tables and chains ("SMA m"). */
export const genderShortLabels: Record<Gender, string> = { male: 'm', female: 'f' };

export interface ConnectorEnd {
  type: Connector;
  gender: Gender;
}

/**
 * SMA, 3.5 mm and 2.92 mm share the same coupling thread and centre-conductor size and intermate mechanically
 * (common practice; the 3.5 mm/SMA statement also follows IEEE Std 287 on precision coaxial connectors, from
 * memory). 3.5 mm and 2.92 mm are the precision members (air dielectric at the interface); SMA is not.
 */
const smaFamily: ReadonlySet<Connector> = new Set<Connector>(['sma', '3.5mm', '2.92mm']);
const precision: ReadonlySet<Connector> = new Set<Connector>(['3.5mm', '2.92mm']);

/**
 * Whether two connector types can be screwed together, genders aside: the same type, or any two of SMA,
 * 3.5 mm and 2.92 mm. N only with N, BNC only with BNC, `other` only with `other` (common practice).
 */
export function typesIntermate(a: Connector, b: Connector): boolean {
  return a === b || (smaFamily.has(a) && smaFamily.has(b));
}

/**
 * Whether two ends mate: opposite genders and compatible types (see `typesIntermate`).
 *
 * Caution: SMA plugs into 3.5 mm or 2.92 mm jacks mate mechanically, but a worn or out-of-tolerance SMA plug
 * (protruding pin, oversized or bent centre conductor) can damage the precision jack's slotted contact, so
 * gauge SMA plugs first (common practice; `matingWarning` says so for each such joint).
 */
export function mates(a: ConnectorEnd, b: ConnectorEnd): boolean {
  return a.gender !== b.gender && typesIntermate(a.type, b.type);
}

/** One end as a short text: "SMA m", "2.92 mm f". */
export function describeEnd(end: ConnectorEnd): string {
  return `${connectorLabels[end.type]} ${genderShortLabels[end.gender]}`;
}

/** A part's two ends, from the fields a part record carries. */
export function partEnds(p: { connectorA: Connector; genderA: Gender; connectorB: Connector; genderB: Gender }): [ConnectorEnd, ConnectorEnd] {
  return [
    { type: p.connectorA, gender: p.genderA },
    { type: p.connectorB, gender: p.genderB },
  ];
}

/** Both ends of a part as a short text: "SMA m → SMA f". */
export function describeEnds(p: { connectorA: Connector; genderA: Gender; connectorB: Connector; genderB: Gender }): string {
  const [a, b] = partEnds(p);
  return `${describeEnd(a)} → ${describeEnd(b)}`;
}

/**
 * A short caution for a joint that mates but mixes SMA with a precision 3.5 mm or 2.92 mm connector, else null
 * (also null when the ends do not mate). An SMA plug in a precision jack is the risky way round: a worn SMA pin
 * can spread or break the jack's contact fingers; an SMA jack on a precision plug is gentler but an
 * out-of-tolerance SMA still wears the precision connector (common practice).
 */
export function matingWarning(a: ConnectorEnd, b: ConnectorEnd): string | null {
  if (!mates(a, b)) return null;
  const sma = a.type === 'sma' ? a : b.type === 'sma' ? b : null;
  const other = sma === a ? b : a;
  if (!sma || !precision.has(other.type)) return null;
  const name = connectorLabels[other.type];
  return sma.gender === 'male'
    ? `SMA plug into a ${name} jack: a worn SMA pin can damage the precision jack. Gauge the SMA plug first.`
    : `${name} plug into an SMA jack: an out-of-tolerance SMA jack wears the precision plug. Gauge the SMA jack first.`;
}
