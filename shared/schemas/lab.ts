import { z } from 'zod';

/** Public facts about the lab this Skewbench serves (`GET /api/lab`). */
export const labInfoSchema = z.object({
  name: z.string(),
  timeZone: z.string(),
  /** The address people use to reach Skewbench (QR labels point here). */
  publicUrl: z.string(),
});
export type LabInfo = z.infer<typeof labInfoSchema>;

export const healthSchema = z.object({
  status: z.enum(['ok', 'unavailable']),
  db: z.enum(['ok', 'down']),
});
