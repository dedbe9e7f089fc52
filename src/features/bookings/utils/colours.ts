import theme from '../../../../tailwind.config';

const { colors } = theme.theme.extend;

/**
 * One colour per instrument on the calendar, taken from Skewbench's own palette (tailwind.config.ts) so the
 * calendar matches the rest of the app. Every shade carries white event text at a contrast of at least 5:1;
 * neighbours in the list differ in hue, so instruments with consecutive ids look different.
 */
export const instrumentPalette = [
  colors.copper[600],
  colors.phase[600],
  colors.caution[700],
  colors.ink[500],
  colors.pass[700],
  colors.fault[500],
  colors.phase[800],
  colors.copper[800],
  colors.ink[700],
  colors.fault[700],
  colors.phase[700],
  colors.copper[700],
] as const;

/** The calendar colour of an instrument: the same for the same id, in every browser and session. */
export function instrumentColour(instrumentId: number): string {
  const index = ((instrumentId % instrumentPalette.length) + instrumentPalette.length) % instrumentPalette.length;
  return instrumentPalette[index]!;
}

/** Maintenance blocks: grey, hatched (see booking-calendar.css), whatever the instrument. */
export const maintenanceColours = { background: colors.ink[100], border: colors.ink[300], text: colors.ink[700] } as const;
