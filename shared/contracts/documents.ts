import { z } from 'zod';
import { isCalendarDate } from '../domain/calendar-date';

export const DOCUMENT_KINDS = ['registration', 'permit', 'food_handler', 'food_manager', 'inspection_report', 'insurance', 'water_test', 'other'] as const;
export const DOCUMENT_KIND_LABELS: Record<(typeof DOCUMENT_KINDS)[number], string> = {
  registration: 'Cottage-food registration',
  permit: 'Permit or licence',
  food_handler: 'Food handler certificate',
  food_manager: 'Food manager certificate',
  inspection_report: 'Inspection report',
  insurance: 'Insurance',
  water_test: 'Water test',
  other: 'Other',
};

const DateSchema = z.string().trim().refine(isCalendarDate, 'Enter a date as YYYY-MM-DD');
const OptionalDateSchema = z.preprocess((v) => (v === '' || v === null ? undefined : v), DateSchema.optional());
const expiryAfterIssue = (v: { issuedOn: string; expiresOn?: string | undefined }, ctx: z.RefinementCtx) => {
  if (v.expiresOn && v.expiresOn <= v.issuedOn) ctx.addIssue({ code: 'custom', path: ['expiresOn'], message: 'The expiry date must be after the issue date' });
};

const VersionFields = {
  issuedOn: DateSchema,
  expiresOn: OptionalDateSchema,
};

/** Fields of POST /api/documents (multipart, with `file`: PDF, JPEG or PNG up to 10 MB). */
export const CreateDocumentInputSchema = z
  .object({
    kind: z.enum(DOCUMENT_KINDS, 'Choose what kind of document this is'),
    title: z.string().trim().min(1, 'Enter a title').max(160, 'Keep the title under 160 characters'),
    holderUserId: z.preprocess((v) => (v === '' ? undefined : v), z.string().uuid('Choose a team member').optional()),
    ...VersionFields,
  })
  .strict()
  .superRefine(expiryAfterIssue);
export type CreateDocumentInput = z.infer<typeof CreateDocumentInputSchema>;

/** Fields of POST /api/documents/:documentId/versions: a renewed or replaced file. */
export const NewDocumentVersionInputSchema = z
  .object({
    title: z.preprocess((v) => (v === '' ? undefined : v), z.string().trim().min(1).max(160).optional()),
    reason: z.string().trim().min(1, 'Say why this replaces the current file (e.g. "Renewed")').max(500),
    ...VersionFields,
  })
  .strict()
  .superRefine(expiryAfterIssue);
export type NewDocumentVersionInput = z.infer<typeof NewDocumentVersionInputSchema>;

export const DocumentParamsSchema = z.object({ documentId: z.string().uuid('That id is not valid') });
export const DocumentVersionParamsSchema = DocumentParamsSchema.extend({ versionId: z.string().uuid('That id is not valid') });

export const DocumentVersionSchema = z.object({
  id: z.string().uuid(),
  version: z.number(),
  title: z.string(),
  issuedOn: z.string(),
  expiresOn: z.string().nullable(),
  displayName: z.string(),
  contentType: z.string(),
  byteSize: z.number(),
  reason: z.string().nullable(),
  uploadedBy: z.string().nullable(),
  createdAt: z.string(),
});
export type DocumentVersion = z.infer<typeof DocumentVersionSchema>;

export const DocumentSchema = z.object({
  id: z.string().uuid(),
  kind: z.enum(DOCUMENT_KINDS),
  holder: z.object({ userId: z.string(), displayName: z.string() }).nullable(),
  current: DocumentVersionSchema,
  versionCount: z.number(),
  expiryStatus: z.enum(['no_expiry', 'valid', 'expiring_soon', 'expired']),
  /** Days from today (business time zone) to the expiry date; null when it never expires. */
  daysLeft: z.number().nullable(),
});
export type Document = z.infer<typeof DocumentSchema>;

/** GET /api/documents */
export const DocumentListSchema = z.object({ documents: z.array(DocumentSchema), today: z.string() });
export type DocumentList = z.infer<typeof DocumentListSchema>;

/** GET /api/documents/:documentId */
export const DocumentDetailSchema = DocumentSchema.extend({ versions: z.array(DocumentVersionSchema) });
export type DocumentDetail = z.infer<typeof DocumentDetailSchema>;

/** POST /api/calendar-feeds (owner). */
export const CreateCalendarFeedInputSchema = z.object({ name: z.string().trim().min(1, 'Name the feed (e.g. "My phone")').max(80) }).strict();
export type CreateCalendarFeedInput = z.infer<typeof CreateCalendarFeedInputSchema>;
export const CalendarFeedSchema = z.object({
  id: z.string().uuid(),
  name: z.string(),
  createdAt: z.string(),
  lastFetchedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
});
export type CalendarFeed = z.infer<typeof CalendarFeedSchema>;
/** 201 answer: the feed URL holds the token and is shown this once. */
export const CreatedCalendarFeedSchema = z.object({ feed: CalendarFeedSchema, url: z.string() });
export type CreatedCalendarFeed = z.infer<typeof CreatedCalendarFeedSchema>;
export const CalendarFeedParamsSchema = z.object({ feedId: z.string().uuid('That id is not valid') });
