import { z } from 'zod';

/** Public facts about the lab this Skewbench serves (`GET /api/lab`). */
export const labInfoSchema = z.object({
  name: z.string(),
  timeZone: z.string(),
  /** The address people use to reach Skewbench (QR labels point here). */
  publicUrl: z.string(),
  /** How mail leaves: `captureInUse` when the local capture receives it all (no SMTP_URL), and the From address. */
  mail: z.object({ captureInUse: z.boolean(), from: z.string() }),
});
export type LabInfo = z.infer<typeof labInfoSchema>;

export const healthSchema = z.object({
  status: z.enum(['ok', 'unavailable']),
  db: z.enum(['ok', 'down']),
});
