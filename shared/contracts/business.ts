import { z } from 'zod';
import { validateLotCodeTemplate } from '../domain/lot-codes';
import { isValidTimeZone } from '../domain/zoned-time';

const text = (max: number, what: string) => z.string().trim().max(max, `Keep ${what} under ${max} characters`);

/** GET /api/business: the business profile every member can read. */
export const BusinessSchema = z.object({
  id: z.string().uuid(),
  name: z.string(),
  addressLine: z.string(),
  city: z.string(),
  region: z.string(),
  postalCode: z.string(),
  country: z.string(),
  phone: z.string(),
  email: z.string(),
  registrationNumber: z.string(),
  registrationAuthority: z.string(),
  timeZone: z.string(),
  ruleProfileId: z.string(),
  ruleProfileName: z.string(),
  lotCodePrefix: z.string(),
  lotCodeTemplate: z.string(),
  isDemo: z.boolean(),
});
export type Business = z.infer<typeof BusinessSchema>;

/** PATCH /api/business (owner): any subset of the editable fields. */
export const UpdateBusinessInputSchema = z
  .object({
    name: z.string('Enter the business name').trim().min(1, 'Enter the business name').max(120, 'Keep the name under 120 characters'),
    addressLine: text(200, 'the address'),
    city: text(100, 'the town'),
    region: text(100, 'the state or region'),
    postalCode: text(20, 'the postal code'),
    country: z.enum(['US', 'GB', 'EU'], 'Choose US, GB or EU'),
    phone: text(40, 'the phone number'),
    email: z.union([z.literal(''), z.string().trim().toLowerCase().pipe(z.email('Enter an e-mail address such as name@example.com'))]),
    registrationNumber: text(80, 'the registration number'),
    registrationAuthority: text(160, 'the authority'),
    timeZone: z.string('Choose a time zone').trim().refine(isValidTimeZone, 'Use an IANA time zone such as America/Chicago'),
    ruleProfileId: z.string('Choose a rule profile').trim().min(1, 'Choose a rule profile').max(64),
    lotCodePrefix: z.string().trim().regex(/^[A-Z0-9]{1,8}$/, 'Use 1 to 8 capital letters or digits'),
    lotCodeTemplate: z.string().trim().superRefine((t, ctx) => {
      for (const message of validateLotCodeTemplate(t)) ctx.addIssue({ code: 'custom', message });
    }),
  })
  .partial()
  .strict();
export type UpdateBusinessInput = z.infer<typeof UpdateBusinessInputSchema>;
