import { z } from 'zod';
import { isCalendarDate } from '../domain/calendar-date';
import { EmailSchema } from './auth';

/** Links last a week unless the owner chooses otherwise, and never more than 30 days. */
export const INSPECTOR_LINK_DEFAULT_DAYS = 7;
export const INSPECTOR_LINK_MAX_DAYS = 30;

const DateSchema = z.string().trim().refine(isCalendarDate, 'Enter a date as YYYY-MM-DD');

/** POST /api/inspector-links (owner). */
export const CreateInspectorLinkInputSchema = z
  .object({
    inspectorName: z.string().trim().min(1, 'Enter the inspector\'s name or office').max(120),
    inspectorEmail: z.preprocess((v) => (v === '' ? undefined : v), EmailSchema.optional()),
    rangeFrom: DateSchema,
    rangeTo: DateSchema,
    validDays: z.coerce.number().int('Whole days only').min(1, 'At least 1 day').max(INSPECTOR_LINK_MAX_DAYS, `At most ${INSPECTOR_LINK_MAX_DAYS} days`).default(INSPECTOR_LINK_DEFAULT_DAYS),
  })
  .strict()
  .superRefine((v, ctx) => {
    if (v.rangeTo < v.rangeFrom) ctx.addIssue({ code: 'custom', path: ['rangeTo'], message: 'The end of the range must be on or after its start' });
  });
export type CreateInspectorLinkInput = z.input<typeof CreateInspectorLinkInputSchema>;

export const InspectorViewSchema = z.object({ path: z.string(), at: z.string(), visitor: z.string() });
export const InspectorLinkSchema = z.object({
  id: z.string().uuid(),
  inspectorName: z.string(),
  inspectorEmail: z.string().nullable(),
  rangeFrom: z.string(),
  rangeTo: z.string(),
  expiresAt: z.string(),
  revokedAt: z.string().nullable(),
  createdAt: z.string(),
  status: z.enum(['active', 'expired', 'revoked']),
  views: z.array(InspectorViewSchema),
});
export type InspectorLink = z.infer<typeof InspectorLinkSchema>;
export const InspectorLinkListSchema = z.object({ links: z.array(InspectorLinkSchema) });
/** 201 answer: the URL holds the token and is shown this once (and e-mailed when an address is given). */
export const CreatedInspectorLinkSchema = z.object({ link: InspectorLinkSchema, url: z.string(), emailed: z.boolean() });
export type CreatedInspectorLink = z.infer<typeof CreatedInspectorLinkSchema>;
export const InspectorLinkParamsSchema = z.object({ linkId: z.string().uuid('That id is not valid') });

/** GET /api/inspector/session (inspector). */
export const InspectorSessionSchema = z.object({
  businessName: z.string(),
  businessAddress: z.string(),
  registrationNumber: z.string(),
  inspectorName: z.string(),
  rangeFrom: z.string(),
  rangeTo: z.string(),
  expiresAt: z.string(),
  timeZone: z.string(),
  packetAvailable: z.boolean(),
});
export type InspectorSession = z.infer<typeof InspectorSessionSchema>;

/** GET /api/inspector/records (inspector): the records of the link's range, no customer data. */
export const InspectorRecordsSchema = z.object({
  batches: z.array(z.object({ id: z.string(), lotCode: z.string(), productName: z.string(), madeOn: z.string(), state: z.string() })),
  holdingPeriods: z.array(z.object({
    id: z.string(), lotCode: z.string(), kind: z.string(), policy: z.string(), startedAt: z.string(), startedByName: z.string(), limitMinutes: z.number().nullable(),
    stoppedAt: z.string().nullable(),
    actions: z.array(z.object({ action: z.string(), reason: z.string(), recordedAt: z.string(), recordedByName: z.string() })),
  })),
  /** Cleaning runs of the range with the signature of their current version (printed name, meaning, time, validity). */
  cleaningRuns: z.array(z.object({
    id: z.string(), templateName: z.string(), runDate: z.string(), batchLotCode: z.string().nullable(), status: z.string(),
    signature: z.object({ printedName: z.string(), meaning: z.string(), signedAtLocal: z.string(), validityText: z.string() }).nullable(),
  })),
  documents: z.array(z.object({ documentId: z.string(), versionId: z.string(), kind: z.string(), title: z.string(), issuedOn: z.string(), expiresOn: z.string().nullable() })),
  recordEvents: z.array(z.object({ seq: z.number(), occurredAt: z.string(), entityType: z.string(), action: z.string(), actorName: z.string() })),
});
export type InspectorRecords = z.infer<typeof InspectorRecordsSchema>;
