import { z } from 'zod';
import { isCalendarDate } from '../domain/calendar-date';

/** Records are kept at least 2 years (21 CFR 117.315, value from memory); one packet may span 3. */
export const AUDIT_PACKET_MAX_DAYS = 1096;

const DateSchema = z.string().trim().refine(isCalendarDate, 'Enter a date as YYYY-MM-DD');

const daysBetween = (from: string, to: string) => Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000);

/** POST /api/audit-packets (owner): business-local calendar dates, both ends included. */
export const AuditPacketInputSchema = z
  .object({ from: DateSchema, to: DateSchema })
  .strict()
  .superRefine((v, ctx) => {
    if (!isCalendarDate(v.from) || !isCalendarDate(v.to)) return;
    if (v.to < v.from) ctx.addIssue({ code: 'custom', path: ['to'], message: 'The end of the range must be on or after its start' });
    else if (daysBetween(v.from, v.to) >= AUDIT_PACKET_MAX_DAYS) ctx.addIssue({ code: 'custom', path: ['to'], message: 'One packet covers at most 3 years; export longer periods in parts' });
  });
export type AuditPacketInput = z.infer<typeof AuditPacketInputSchema>;

export const ChainResultSchema = z.object({
  ok: z.boolean(),
  count: z.number().int(),
  headHash: z.string(),
  headSeq: z.number().int().nullable(),
  firstBadSeq: z.number().int().nullable(),
  problem: z.enum(['hash_mismatch', 'broken_link', 'gap_in_sequence']).nullable(),
});
export type ChainResult = z.infer<typeof ChainResultSchema>;

/** manifest.json, the last file in every packet. */
export const AuditPacketManifestSchema = z.object({
  format: z.literal('crumbtrail-audit-packet/1'),
  business: z.object({ id: z.string(), name: z.string(), timeZone: z.string() }),
  range: z.object({ from: z.string(), to: z.string() }),
  exportedAt: z.string(),
  exportedBy: z.object({ name: z.string(), role: z.string() }),
  chain: ChainResultSchema,
  /** The record event that logs this export (it comes after the head above). */
  exportEvent: z.object({ seq: z.number().int(), hash: z.string() }),
  files: z.array(z.object({ name: z.string(), bytes: z.number().int(), sha256: z.string(), rows: z.number().int().nullable() })),
  /** Sections left out of this packet and why. */
  omitted: z.array(z.object({ section: z.string(), reason: z.string() })),
});
export type AuditPacketManifest = z.infer<typeof AuditPacketManifestSchema>;
