// The words of every message Loopfold sends, as small pure functions: data in,
// { subject, text, html } out. Plain text is the message; the HTML part is the
// same text with clickable links, for mail programs that prefer HTML.
import { formatMomentAbsolute } from '@/lib/moment-text';
import { formatLongDate, type LocalDate } from '@/lib/calendar';
import { textToHtml } from './text-links';
import { sealDifference } from '@/lib/trips/seal-check';
import { DUE_SOON_DAYS } from '@/lib/inspections/inspection-due';

export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

/** What the mailer records as the message's kind (mail_outbox.kind). */
export type MailKind =
  | 'invite'
  | 'password_reset'
  | 'planner_digest'
  | 'collection_request'
  | 'damage_report'
  | 'seal_mismatch'
  | 'collection_confirmation'
  | 'overdue_reminder'
  | 'count_due'
  | 'liner_lot_notice'
  | 'liner_purchase_order'
  | 'liner_reorder_alert'
  | 'invoice_issued'
  | 'payment_received'
  | 'payment_reminder';

function compose(subject: string, lines: string[]): MailContent {
  const text = `${lines
    .join('\n')
    .replace(/\n{3,}/g, '\n\n')
    .trim()}\n`;
  return { subject, text, html: textToHtml(text) };
}

function signature(operatorName: string): string[] {
  return ['', `— ${operatorName}, sent by Loopfold`];
}

export interface InviteMailInput {
  recipientName: string;
  recipientEmail: string;
  roleLabel: string;
  organisationName: string;
  operatorName: string;
  inviterName: string;
  link: string;
  expiresAt: Date;
  timeZone: string;
}

export function inviteMail(i: InviteMailInput): MailContent {
  const where = i.organisationName === i.operatorName ? i.operatorName : `${i.organisationName} (with ${i.operatorName})`;
  return compose(`Your Loopfold account at ${i.operatorName}`, [
    `Hello ${i.recipientName},`,
    '',
    `${i.inviterName} has opened a Loopfold account for you: ${i.roleLabel}, ${where}.`,
    '',
    `Choose your password with this link. It works once, until ${formatMomentAbsolute(i.expiresAt, i.timeZone)} (${i.timeZone} time):`,
    i.link,
    '',
    `After that, sign in with your e-mail address (${i.recipientEmail}) and the password you chose.`,
    '',
    'If you were not expecting this, you can ignore this message: nothing happens unless the link is used.',
    ...signature(i.operatorName),
  ]);
}

export interface ResetMailInput {
  recipientName: string;
  recipientEmail: string;
  operatorName: string;
  link: string;
  validForMinutes: number;
}

export function passwordResetMail(i: ResetMailInput): MailContent {
  const validity = i.validForMinutes % 60 === 0 ? `${i.validForMinutes / 60} hour${i.validForMinutes === 60 ? '' : 's'}` : `${i.validForMinutes} minutes`;
  return compose('Reset your Loopfold password', [
    `Hello ${i.recipientName},`,
    '',
    `Someone asked to reset the password of the Loopfold account ${i.recipientEmail} at ${i.operatorName}.`,
    '',
    `Choose a new password with this link. It works once, within ${validity}:`,
    i.link,
    '',
    'If you did not ask for this, ignore this message: your password stays as it is.',
    ...signature(i.operatorName),
  ]);
}

// Mail to planners about requests from outside (the public bin page, later the
// portal). Unlike the public page, these may name the site and the customer:
// they go to the operator's own staff only.

export type RequestSource = 'public' | 'portal' | 'planner' | 'yard';

const SOURCE_WORDS: Record<RequestSource, string> = {
  public: 'the public bin page (someone who scanned a label)',
  portal: 'the customer portal',
  planner: 'a planner',
  yard: 'a yard',
};

export interface RequestMailBin {
  serial: string;
  /** The GRAI grouped for reading (groupGrai). */
  grai: string;
}

interface RequestMailCommon {
  operatorName: string;
  source: RequestSource;
  bin: RequestMailBin | null;
  siteName: string | null;
  customerName: string | null;
  receivedAt: Date;
  timeZone: string;
  /** The planners' requests page (APP_URL + /requests). */
  link: string;
}

export interface CollectionRequestMailInput extends RequestMailCommon {
  quantity: number;
  locationNote: string | null;
  contactName: string | null;
  contactPhone: string | null;
  contactEmail: string | null;
  note: string | null;
  /** The day the empties are ready (portal requests). */
  readyOn?: LocalDate | null;
}

export interface DamageReportMailInput extends RequestMailCommon {
  description: string;
  hasPhoto: boolean;
  contactName: string | null;
  contactEmail: string | null;
}

const bins = (n: number) => `${n} folded bin${n === 1 ? '' : 's'}`;

function whereLine(i: RequestMailCommon): string {
  if (!i.siteName) return 'Where: not known from the bin (it is not recorded at a site); see the spot below.';
  return `Where: ${i.siteName}${i.customerName ? ` (${i.customerName})` : ''}`;
}

function binLine(bin: RequestMailBin | null): string {
  return bin ? `Bin scanned: serial ${bin.serial}, GRAI ${bin.grai}` : 'Bin scanned: none (sent without a bin label)';
}

function contactLine(name: string | null, phone: string | null, email: string | null): string {
  const parts = [name, phone, email].filter((p): p is string => !!p);
  return `Contact: ${parts.length ? parts.join(' · ') : 'none given'}`;
}

function receivedLine(i: RequestMailCommon): string {
  return `Received ${formatMomentAbsolute(i.receivedAt, i.timeZone)} (${i.timeZone} time) through ${SOURCE_WORDS[i.source]}.`;
}

export function collectionRequestMail(i: CollectionRequestMailInput): MailContent {
  const at = i.siteName ?? (i.bin ? `bin ${i.bin.serial}` : 'an unknown site');
  return compose(`Collection request: ${bins(i.quantity)} at ${at}`, [
    `${bins(i.quantity)} ${i.quantity === 1 ? 'is' : 'are'} empty and ready for collection.`,
    '',
    whereLine(i),
    ...(i.readyOn ? [`Ready from: ${formatLongDate(i.readyOn)}`] : []),
    ...(i.locationNote ? [`Exact spot: ${i.locationNote}`] : []),
    binLine(i.bin),
    contactLine(i.contactName, i.contactPhone, i.contactEmail),
    ...(i.note ? ['', 'Note from the sender:', i.note] : []),
    '',
    receivedLine(i),
    '',
    'Schedule the collection on the requests page:',
    i.link,
    ...signature(i.operatorName),
  ]);
}

export function damageReportMail(i: DamageReportMailInput): MailContent {
  const what = i.bin ? `bin ${i.bin.serial}` : 'a bin';
  return compose(`Damage reported on ${what}${i.siteName ? ` at ${i.siteName}` : ''}`, [
    `Someone reported damage on ${what}:`,
    '',
    i.description,
    '',
    whereLine(i),
    binLine(i.bin),
    contactLine(i.contactName, null, i.contactEmail),
    i.hasPhoto ? 'A photo came with the report; see it on the requests page.' : 'No photo came with the report.',
    '',
    receivedLine(i),
    '',
    'Triage it on the requests page; the bin stays in service until someone quarantines it:',
    i.link,
    ...signature(i.operatorName),
  ]);
}

export interface CollectionConfirmationInput {
  recipientName: string;
  operatorName: string;
  siteName: string;
  quantity: number;
  readyOn: LocalDate;
  /** The portal's collections page. */
  link: string;
}

/** To the customer user who asked for a collection through the portal: what we received. */
export function collectionConfirmationMail(i: CollectionConfirmationInput): MailContent {
  return compose(`We have your collection request: ${bins(i.quantity)} at ${i.siteName}`, [
    `Hello ${i.recipientName},`,
    '',
    `Thank you: we have your request to collect ${bins(i.quantity)} at ${i.siteName}, ready from ${formatLongDate(i.readyOn)}.`,
    '',
    'Our planners will plan the run and the day will show beside the request in the portal:',
    i.link,
    '',
    'Keep the folded bins together with their lids and valve caps, out of the way of traffic.',
    ...signature(i.operatorName),
  ]);
}

/** How each kind is named on the "Sent mail" page. */
export const MAIL_KIND_LABELS: Record<MailKind, string> = {
  invite: 'Invitation',
  password_reset: 'Password reset',
  planner_digest: 'Morning digest',
  collection_request: 'Collection request',
  collection_confirmation: 'Collection confirmation',
  damage_report: 'Damage report',
  seal_mismatch: 'Seal mismatch alert',
  overdue_reminder: 'Overdue-return reminder',
  count_due: 'Monthly count due',
  liner_lot_notice: 'Liner lot notice',
  liner_purchase_order: 'Liner purchase order',
  liner_reorder_alert: 'Liner reorder alert',
  invoice_issued: 'Invoice issued',
  payment_received: 'Payment received',
  payment_reminder: 'Payment reminder',
};

const OPT_OUT_LINE = (accountLink: string) => `You get this reminder because reminders are on for your account; turn them off here: ${accountLink}`;

export interface OverdueReminderInput {
  recipientName: string;
  operatorName: string;
  freeDays: number;
  bins: Array<{ serial: string; siteName: string | null; daysOver: number }>;
  /** The portal's start page and the account page (for the opt-out). */
  link: string;
  accountLink: string;
}

/** To a customer contact, at most once a week: every bin of theirs past its free days, worst first. */
export function overdueReminderMail(i: OverdueReminderInput): MailContent {
  const n = i.bins.length;
  return compose(`${n} bin${n === 1 ? '' : 's'} past ${n === 1 ? 'its' : 'their'} free days — please send ${n === 1 ? 'it' : 'them'} back`, [
    `Hello ${i.recipientName},`,
    '',
    `These bins have been with you longer than your ${i.freeDays} free days:`,
    '',
    ...i.bins.map((b) => `• ${b.serial}${b.siteName ? ` at ${b.siteName}` : ''}: ${b.daysOver} day${b.daysOver === 1 ? '' : 's'} over`),
    '',
    'When they are empty, fold them and tell us they are ready for collection:',
    i.link,
    '',
    'Fold only empty, drained bins; keep fingers clear of the hinges, and follow your site procedures and the product’s safety data sheet for any residue.',
    '',
    OPT_OUT_LINE(i.accountLink),
    ...signature(i.operatorName),
  ]);
}

export interface CountDueInput {
  recipientName: string;
  operatorName: string;
  monthName: string;
  /** The last day of the grace period, e.g. "7 Jan 2027". */
  dueBy: string;
  sites: Array<{ name: string; bins: number; link: string }>;
  accountLink: string;
}

/** To a customer contact, once a month: the sites whose monthly count is still to confirm. */
export function countDueMail(i: CountDueInput): MailContent {
  return compose(`Monthly count for ${i.monthName}: ${i.sites.length} site${i.sites.length === 1 ? '' : 's'} to confirm`, [
    `Hello ${i.recipientName},`,
    '',
    `Please confirm the bins you hold for ${i.monthName} by ${i.dueBy}: tick them on our list, or scan their labels with your phone.`,
    '',
    ...i.sites.map((s) => `• ${s.name} (${s.bins} bin${s.bins === 1 ? '' : 's'} on our list): ${s.link}`),
    '',
    'Count from the ground or a safe platform; do not climb stacks, and keep clear of moving forklifts.',
    '',
    OPT_OUT_LINE(i.accountLink),
    ...signature(i.operatorName),
  ]);
}

export interface DigestInput {
  recipientName: string;
  operatorName: string;
  day: string; // '1 Dec 2026'
  appUrl: string;
  overdueByCustomer: Array<{ customer: string; bins: number; oldestDays: number }>;
  flaggedScans: number;
  sealMismatches: number;
  openCollectionRequests: number;
  testsDueSoon: number;
  testsLapsed: number;
  markedMissing: number;
}

/** The planners' morning digest: what needs a decision today, with links. */
export function plannerDigestMail(d: DigestInput): MailContent {
  const overdueTotal = d.overdueByCustomer.reduce((s, c) => s + c.bins, 0);
  const lines = [
    `Hello ${d.recipientName},`,
    '',
    `The pool on ${d.day}:`,
    '',
    `• ${overdueTotal} bin${overdueTotal === 1 ? '' : 's'} overdue back from customers (past their free days)`,
    ...d.overdueByCustomer.map((c) => `    ${c.customer}: ${c.bins} (oldest ${c.oldestDays} days on hire)`),
    `• ${d.openCollectionRequests} open collection request${d.openCollectionRequests === 1 ? '' : 's'}`,
    `• ${d.flaggedScans} scan${d.flaggedScans === 1 ? '' : 's'} flagged in the last 24 hours (missed steps inferred)${d.sealMismatches ? `, ${d.sealMismatches} with seal numbers that did not match` : ''}`,
    `• ${d.testsDueSoon} bin${d.testsDueSoon === 1 ? '' : 's'} due for a periodic test within ${DUE_SOON_DAYS} days; ${d.testsLapsed} already lapsed`,
    ...(d.markedMissing ? [`• ${d.markedMissing} bin${d.markedMissing === 1 ? '' : 's'} marked missing overnight by the missing-bin rule`] : []),
    '',
    `Open the pool overview: ${d.appUrl.replace(/\/$/, '')}/fleet`,
    ...signature(d.operatorName),
  ];
  return compose(`Pool digest ${d.day}: ${overdueTotal} overdue, ${d.testsLapsed} tests lapsed`, lines);
}

export interface SealMismatchInput {
  operatorName: string;
  serial: string;
  grai: string;
  siteName: string | null;
  customerName: string | null;
  applied: string[];
  found: string[];
  at: Date;
  timeZone: string;
  link: string;
}

/** Sent to planners at once when the seals found at discharge differ from those fitted at filling. */
export function sealMismatchMail(m: SealMismatchInput): MailContent {
  const { missing, unexpected: extra } = sealDifference(m.applied, m.found);
  return compose(`Seal mismatch on bin ${m.serial}${m.customerName ? ` at ${m.customerName}` : ''}`, [
    `At ${formatMomentAbsolute(m.at, m.timeZone)} the seals checked on bin ${m.serial} (${m.grai})${m.siteName ? ` at ${m.siteName}` : ''} did not match those fitted when it was filled.`,
    '',
    `Fitted at filling: ${m.applied.length ? m.applied.join(', ') : 'none recorded'}`,
    `Found at discharge: ${m.found.length ? m.found.join(', ') : 'none'}`,
    ...(missing.length ? [`Not found: ${missing.join(', ')}`] : []),
    ...(extra.length ? [`Unexpected: ${extra.join(', ')}`] : []),
    '',
    'The load may have been opened on the way. Check with the customer before the product is used, and follow your procedure for suspected tampering.',
    '',
    `The bin's page: ${m.link}`,
    ...signature(m.operatorName),
  ]);
}

export interface LinerLotNoticeInput {
  operatorName: string;
  customerName: string;
  lotNumber: string;
  supplier: string;
  status: 'released' | 'on_hold' | 'recalled';
  message: string;
  uses: Array<{ serial: string; what: string; fillDay: string | null; product: string | null; site: string | null }>;
}

/** A customer's notice about a liner lot on hold or recalled: the planner's words and that customer's bins. */
export function linerLotNoticeMail(n: LinerLotNoticeInput): MailContent {
  const state = n.status === 'recalled' ? 'recalled' : n.status === 'on_hold' ? 'put on hold' : 'released again';
  return compose(`Liner lot ${n.lotNumber} ${state}: ${n.uses.length} of your bins concerned`, [
    `Hello ${n.customerName},`,
    '',
    `Liner lot ${n.lotNumber} (${n.supplier}) has been ${state}. These bins of yours were lined from it:`,
    '',
    ...n.uses.map((u) => `• ${u.serial}: ${[u.what, u.fillDay && `filled ${u.fillDay}`, u.product, u.site].filter(Boolean).join(', ')}`),
    '',
    n.message.trim(),
    '',
    'Follow your own procedures and the product’s safety data sheet for product that may be affected, and reply to this message with any questions.',
    ...signature(n.operatorName),
  ]);
}

export interface PurchaseOrderMailInput {
  operatorName: string;
  supplierName: string;
  reference: string;
  orderedOn: string; // '1 Dec 2026'
  wantedBy: string;
  quantity: number;
  articleNumber: string | null;
  specName: string;
  pricePerLiner: string;
  deliverTo: { name: string; address: string | null };
  note: string | null;
  plannerName: string;
}

/** The purchase order as sent to the supplier's order address. */
export function purchaseOrderMail(p: PurchaseOrderMailInput): MailContent {
  const qty = p.quantity.toLocaleString('en-GB');
  return compose(`Purchase order ${p.reference}: ${qty} liners${p.articleNumber ? ` (${p.articleNumber})` : ''}`, [
    `Hello ${p.supplierName},`,
    '',
    `Please supply the following and quote ${p.reference} on the delivery note and on each carton's label:`,
    '',
    `  ${qty} × ${p.specName}${p.articleNumber ? `, your article ${p.articleNumber}` : ''}, at ${p.pricePerLiner} a liner`,
    `  Wanted by ${p.wantedBy} (ordered ${p.orderedOn})`,
    `  Deliver to: ${p.deliverTo.name}${p.deliverTo.address ? `, ${p.deliverTo.address}` : ''}`,
    ...(p.note ? ['', p.note] : []),
    '',
    'With each lot, please send its lot number, manufacture and expiry dates and, for food-contact liners, the declaration of compliance.',
    '',
    `${p.plannerName}, ${p.operatorName}`,
    ...signature(p.operatorName),
  ]);
}

export interface ReorderAlertMailInput {
  recipientName: string;
  operatorName: string;
  link: string;
  below: Array<{ depot: string; spec: string; position: number; reorderPoint: number; suggested: number }>;
}

/** Planners are told once when a depot's stock of a spec falls below its reorder point. */
export function reorderAlertMail(a: ReorderAlertMailInput): MailContent {
  const n = (v: number) => Math.round(v).toLocaleString('en-GB');
  return compose(`Liner stock below the reorder point: ${a.below.map((b) => `${b.spec} at ${b.depot}`).join(', ')}`, [
    `Hello ${a.recipientName},`,
    '',
    'On hand, in transit and on order together are now below the reorder point for:',
    '',
    ...a.below.map((b) => `• ${b.spec} at ${b.depot}: ${n(b.position)} against a reorder point of ${n(b.reorderPoint)}; suggested order ${n(b.suggested)}`),
    '',
    `Order from the stock page: ${a.link}`,
    'You will not be told again about these until their stock has recovered.',
    ...signature(a.operatorName),
  ]);
}

export interface InvoiceMailInput {
  customer: string;
  operatorName: string;
  number: string;
  /** Formatted, e.g. "2,029.29 EUR". */
  amount: string;
  dueOn: string;
  /** The invoice in the portal, where it can be paid online. */
  link: string;
}

/** To the customer's contact address when a statement is invoiced. */
export function invoiceIssuedMail(i: InvoiceMailInput): MailContent {
  return compose(`Invoice ${i.number}: ${i.amount}, due ${i.dueOn}`, [
    `Hello ${i.customer},`,
    '',
    `Invoice ${i.number} for ${i.amount} is ready, due on ${i.dueOn}. It carries your hire statement line by line.`,
    `See it, download it and pay online: ${i.link}`,
    ...signature(i.operatorName),
  ]);
}

export interface PaymentReceivedInput {
  customer: string;
  operatorName: string;
  number: string;
  amount: string;
  /** What is still open after this payment, formatted; null when settled. */
  outstanding: string | null;
  link: string;
}

export function paymentReceivedMail(i: PaymentReceivedInput): MailContent {
  return compose(`Payment received for invoice ${i.number}: ${i.amount}`, [
    `Hello ${i.customer},`,
    '',
    `Thank you: we received ${i.amount} for invoice ${i.number}.`,
    i.outstanding ? `${i.outstanding} is still open on it.` : 'The invoice is now settled.',
    i.link,
    ...signature(i.operatorName),
  ]);
}

export interface PaymentReminderInput {
  customer: string;
  operatorName: string;
  invoices: Array<{ number: string; outstanding: string; dueOn: string; link: string }>;
}

/** Unpaid invoices past their due date by the operator's reminder days, in one mail per customer. */
export function paymentReminderMail(i: PaymentReminderInput): MailContent {
  return compose(`Payment reminder: ${i.invoices.length} invoice${i.invoices.length === 1 ? '' : 's'} past due`, [
    `Hello ${i.customer},`,
    '',
    `Our records show ${i.invoices.length === 1 ? 'this invoice' : 'these invoices'} still open after the due date:`,
    '',
    ...i.invoices.map((v) => `• ${v.number}: ${v.outstanding} open, due ${v.dueOn} — ${v.link}`),
    '',
    'If you paid in the last few days, thank you and please ignore this reminder.',
    ...signature(i.operatorName),
  ]);
}
