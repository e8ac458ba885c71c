import { randomBytes } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { PDFDocument, StandardFonts } from 'pdf-lib';
import type { SeedContext, SeedStep } from './demo';
import { businesses } from '../schema/business';
import { localDiskStorage } from '../../lib/storage';
import type { CheckedFile } from '../../lib/uploads';
import { createDocument, runReminderScan } from '../../features/documents/documents.service';
import { createInspectorLink, logInspectorView, revokeInspectorLink, visitorHash } from '../../features/inspector/inspector-links.service';
import { createInvite } from '../../features/team/team.service';
import { queueInviteMail } from '../../features/mail/mail-messages';
import { inProcessCaptureTransport } from '../../features/mail/mail-capture';
import { runMailOnce } from '../../features/mail/mail.service';
import { addCalendarDays } from '../../../shared/domain/calendar-date';
import { businessLocalDate, localDateTimeToInstants } from '../../../shared/domain/zoned-time';

const DEMO_MAIL_FROM = 'Crumbtrail <no-reply@crumbtrail.invalid>';

/** A one-page PDF standing in for the scanned paper document (invented text). */
async function demoPdf(title: string, lines: string[], fileName: string): Promise<CheckedFile> {
  const pdf = await PDFDocument.create();
  pdf.setTitle(title);
  const font = await pdf.embedFont(StandardFonts.Helvetica);
  const bold = await pdf.embedFont(StandardFonts.HelveticaBold);
  const page = pdf.addPage([612, 792]);
  page.drawText(title, { x: 56, y: 720, size: 18, font: bold });
  lines.forEach((line, i) => page.drawText(line, { x: 56, y: 684 - i * 20, size: 11, font }));
  page.drawText('Demo document: invented for the Crumbtrail demo, not a real record.', { x: 56, y: 60, size: 9, font });
  return { bytes: Buffer.from(await pdf.save()), kind: 'pdf', contentType: 'application/pdf', displayName: fileName };
}

/** Sends this business's queued mail into captured_mail, as the local stand-in would have received it at `at`. */
const deliver = (ctx: SeedContext, at: Date) =>
  runMailOnce({ db: ctx.db, now: () => at, transport: inProcessCaptureTransport(ctx.db, () => at), from: DEMO_MAIL_FROM, businessId: ctx.businessId });

/**
 * Documents, reminders, inspector links and mail for Juniper Lane Cake Pops: the cottage-food
 * registration (about 5 months left), Ivy's food-handler certificate expiring in 6 days (its 30-day
 * and 7-day reminders in Sent mail), Maren's food-manager certificate, last autumn's inspection
 * report, an inspector link from last week with two views, a revoked link, and an invite e-mail.
 */
export const documentsSeedStep: SeedStep = {
  name: 'documents and inspector links',
  async run(ctx) {
    const { db, businessId, actors, now } = ctx;
    const { owner, helper } = actors;
    const [business] = await db.select({ timeZone: businesses.timeZone, registrationNumber: businesses.registrationNumber }).from(businesses).where(eq(businesses.id, businessId));
    const zone = business!.timeZone;
    const today = businessLocalDate(now, zone);
    const at = (date: string, hhmm: string) => localDateTimeToInstants(`${date}T${hhmm}`, zone)[0]!;
    const storage = localDiskStorage(ctx.uploadDir);
    const uploadedAt = at(addCalendarDays(today, -45), '19:30');

    const registrationExpires = addCalendarDays(today, 152);
    await createDocument(db, storage, owner, {
      kind: 'registration', title: 'Cottage food registration', issuedOn: addCalendarDays(registrationExpires, -365), expiresOn: registrationExpires,
    }, await demoPdf('Cottage Food Operation Registration', [
      'Millbrook County Health Department (invented)',
      `Registration no. ${business!.registrationNumber}`,
      'Operator: Maren Holt, Juniper Lane Cake Pops, 14 Juniper Lane, Millbrook',
      `Valid until ${registrationExpires}`,
    ], 'cottage-food-registration.pdf'), uploadedAt);

    const handlerExpires = addCalendarDays(today, 6);
    await createDocument(db, storage, owner, {
      kind: 'food_handler', title: 'Food handler certificate: Ivy Chen', holderUserId: helper.userId!, issuedOn: addCalendarDays(handlerExpires, -730), expiresOn: handlerExpires,
    }, await demoPdf('Food Handler Certificate', ['Awarded to Ivy Chen', 'Basic food safety course, 2 hours (invented provider)', `Expires ${handlerExpires}`], 'food-handler-ivy-chen.pdf'), uploadedAt);

    const managerExpires = addCalendarDays(today, 3 * 365 + 40);
    await createDocument(db, storage, owner, {
      kind: 'food_manager', title: 'Food manager certificate: Maren Holt', holderUserId: owner.userId!, issuedOn: addCalendarDays(managerExpires, -5 * 365), expiresOn: managerExpires,
    }, await demoPdf('Certified Food Manager', ['Awarded to Maren Holt', 'Food protection manager examination (invented provider)', `Expires ${managerExpires}`], 'food-manager-maren-holt.pdf'), uploadedAt);

    const inspectedOn = addCalendarDays(today, -240);
    await createDocument(db, storage, owner, { kind: 'inspection_report', title: 'Routine inspection report', issuedOn: inspectedOn }, await demoPdf('Routine Inspection Report', [
      'Millbrook County Health Department (invented)',
      `Date of visit: ${inspectedOn}`,
      'Result: satisfactory. No violations observed.',
      'Note: keep sanitiser test strips at the dipping station.',
    ], 'inspection-report.pdf'), uploadedAt);

    // The reminder scan as the scheduler would have run it: the 30-day stage 24 days ago, the 7-day stage today.
    const thirtyDaysOut = at(addCalendarDays(handlerExpires, -30), '07:00');
    await runReminderScan({ db, now: () => thirtyDaysOut, publicBaseUrl: ctx.publicBaseUrl, businessId });
    await deliver(ctx, thirtyDaysOut);

    const inviteAt = at(addCalendarDays(today, -12), '20:15');
    await createInvite(db, owner, { email: 'noor.haddad@example.test', role: 'helper', displayName: 'Noor Haddad' }, inviteAt, (tx, created) => queueInviteMail(tx, owner, created, ctx.publicBaseUrl, inviteAt));
    await deliver(ctx, inviteAt);

    const revokedAt = at(addCalendarDays(today, -20), '09:00');
    const revoked = await createInspectorLink(db, owner, {
      inspectorName: 'Millbrook County Health (sent to the wrong office)', rangeFrom: addCalendarDays(today, -50), rangeTo: addCalendarDays(today, -21), validDays: 7,
    }, ctx.publicBaseUrl, revokedAt);
    await revokeInspectorLink(db, owner, revoked.link.id, new Date(revokedAt.getTime() + 25 * 60_000));

    const issuedAt = at(addCalendarDays(today, -6), '08:40');
    const link = await createInspectorLink(db, owner, {
      inspectorName: 'R. Okonkwo, Millbrook County Health', inspectorEmail: 'r.okonkwo@millbrook-health.test', rangeFrom: addCalendarDays(today, -36), rangeTo: addCalendarDays(today, -6), validDays: 14,
    }, ctx.publicBaseUrl, issuedAt);
    await deliver(ctx, new Date(issuedAt.getTime() + 60_000));
    // Two visits from one (invented) address the next morning: the exchange, then the records.
    const visitor = visitorHash(randomBytes(16).toString('hex'), '203.0.113.24');
    const visit = at(addCalendarDays(today, -5), '10:12');
    await logInspectorView(db, { id: link.link.id, businessId }, '/inspect', visitor, visit);
    await logInspectorView(db, { id: link.link.id, businessId }, '/api/inspector/records', visitor, new Date(visit.getTime() + 2000));

    await runReminderScan({ db, now: () => now, publicBaseUrl: ctx.publicBaseUrl, businessId });
    await deliver(ctx, now);
  },
};
