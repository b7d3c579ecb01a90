// The two forms of the public bin page ("empty and ready for collection",
// "report damage"), received the same way whether the page posts them itself
// (works without JavaScript) or a script calls /api/public/bins/…. Checks, in
// order, so a refused submission stores nothing: the limits already used up,
// the size of the upload, the hidden bot field, the answers, the photo's
// sniffed type; only then does the submission count against the limits and
// get stored.
import type { ZodError } from 'zod';
import { parseGrai } from '@/lib/gs1';
import type { ErrorCode } from '@/lib/api-errors';
import { AppError } from '@/lib/api-errors';
import { collectionRequestFieldsIn, damageReportFieldsIn, fieldProblems, isHoneypotFilled, textFields, type ReportForm } from './report-forms';
import { FALLBACK_LANGUAGE, publicWords, type PublicLanguage, type PublicTranslate } from './public-words';
import { Asset } from '@/models';
import { checkUpload, formFile, MAX_UPLOAD_BYTES, readForm } from '@/lib/attachments.server';
import { hit, publicBinFormLimit, publicFormLimit, secondsBlocked } from '@/lib/rate-limits.server';
import { createCollectionRequest, createDamageReport, type Created } from './requests.server';
import { getSettings } from '@/lib/settings/settings.server';
import type { MailOutcome } from '@/lib/mail/mailer.server';
import { offersCollection } from './public-offer';
import type { Status } from '@/lib/scans/lifecycle';

export interface PublicBin {
  id: number;
  grai: string;
  serial: string;
  customerId: number | null;
  /** Where it stands decides what the page offers (offersCollection()). */
  status: Status;
}

/** The bin behind a Digital Link path value (…/8003/<value>), in any written form of its GRAI. */
export async function binFromDigitalLink(value: string): Promise<{ grai: string | null; problem: string | null; bin: PublicBin | null }> {
  const settings = await getSettings();
  const parsed = parseGrai(`(8003)${value}`, { companyPrefixLength: settings.gs1PrefixLength });
  if (!parsed.ok) return { grai: null, problem: parsed.error.message, bin: null };
  const bin = await Asset.findOne({ where: { grai: parsed.grai.value }, attributes: ['id', 'grai', 'serial', 'customerId', 'status'] });
  return { grai: parsed.grai.value, problem: null, bin: bin ? { id: bin.id, grai: bin.grai, serial: bin.serial, customerId: bin.customerId, status: bin.status } : null };
}

export type IntakeResult =
  | { ok: true; form: ReportForm; delivery: Promise<MailOutcome[]> }
  | {
      ok: false;
      form: ReportForm | null;
      code: ErrorCode;
      message: string;
      /** The first problem per field, to show beside it. */
      fields: Record<string, string>;
      /** What was typed, to fill the form again (never anything about the bin). */
      values: Record<string, string>;
      /** Seconds until the sender may try again (rate limited). */
      retryAfter?: number;
    };

interface IntakeArgs {
  bin: PublicBin;
  request: Request;
  clientAddress: string;
  /** Set when the route names the form; otherwise read from the form's "form" field. */
  form?: ReportForm;
  /** A signed-in visitor (e.g. a customer user of another organisation), recorded as the sender. */
  userId: number | null;
  /** The sender's language for every message back (the page's; English when left out). */
  language?: PublicLanguage;
}

const isForm = (v: unknown): v is ReportForm => v === 'collection' || v === 'damage';

function tooMany(t: PublicTranslate, form: ReportForm | null, seconds: number, perBin: boolean, values: Record<string, string> = {}): IntakeResult {
  const minutes = Math.max(1, Math.ceil(seconds / 60));
  const wait = minutes >= 90 ? t('waitHours', { count: Math.round(minutes / 60) }) : t('waitMinutes', { count: minutes });
  const message = t(perBin ? 'tooManyBin' : 'tooManyHere', { wait });
  return { ok: false, form, code: 'rate_limited', message, fields: {}, values, retryAfter: seconds };
}

/** A refused upload's message in the sender's language (the attachment checks speak English to scripts). */
function uploadProblem(t: PublicTranslate, err: AppError): string {
  const mb = MAX_UPLOAD_BYTES / 1024 / 1024;
  if (err.code === 'payload_too_large') return t('photoTooLarge', { mb });
  if (err.code === 'unsupported_media_type') return t('photoNotImage');
  if (err.code === 'validation_failed') return t('photoEmpty');
  return err.message;
}

export async function receivePublicReport(args: IntakeArgs): Promise<IntakeResult> {
  const t = publicWords(args.language ?? FALLBACK_LANGUAGE);
  const addressKey = `report:${args.clientAddress}`;
  const binKey = `bin:${args.bin.id}`;
  const blockedHere = await secondsBlocked(publicFormLimit(), addressKey);
  if (blockedHere) return tooMany(t, args.form ?? null, blockedHere, false);
  const blockedBin = await secondsBlocked(publicBinFormLimit(), binKey);
  if (blockedBin) return tooMany(t, args.form ?? null, blockedBin, true);

  let form: FormData;
  try {
    form = await readForm(args.request);
  } catch (err) {
    // An oversized upload costs the sender one report: a script cannot retry it for free.
    if (err instanceof AppError && err.code === 'payload_too_large') await hit(publicFormLimit(), addressKey);
    if (err instanceof AppError) {
      const message = err.code === 'payload_too_large' ? t('bodyTooLarge', { mb: MAX_UPLOAD_BYTES / 1024 / 1024 }) : err.message;
      return { ok: false, form: args.form ?? null, code: err.code, message, fields: {}, values: {} };
    }
    throw err;
  }
  const kind = args.form ?? form.get('form');
  if (!isForm(kind)) return { ok: false, form: null, code: 'bad_request', message: t('chooseForm'), fields: {}, values: {} };
  const entries = [...form.entries()];
  const values = textFields(kind, entries);

  // A bot filled the hidden field: it is counted and thanked, and nothing is stored.
  if (isHoneypotFilled(entries)) {
    await hit(publicFormLimit(), addressKey);
    return { ok: true, form: kind, delivery: Promise.resolve([]) };
  }

  const invalid = (error: ZodError): IntakeResult => ({
    ok: false,
    form: kind,
    code: 'validation_failed',
    message: t('needsAnotherLook'),
    fields: fieldProblems(error, t),
    values,
  });
  const common = { source: 'public' as const, assetId: args.bin.id, requesterIp: args.clientAddress };
  let store: () => Promise<Created>;
  if (kind === 'collection') {
    // A bin in our own hands has nothing to collect: the page does not offer it, and a scripted post is refused.
    if (!offersCollection(args.bin.status)) return { ok: false, form: kind, code: 'unprocessable', message: t('atOurSite'), fields: {}, values };
    const parsed = collectionRequestFieldsIn(t).safeParse(values);
    if (!parsed.success) return invalid(parsed.error);
    store = () => createCollectionRequest({ ...common, ...parsed.data, requestedBy: args.userId });
  } else {
    const parsed = damageReportFieldsIn(t).safeParse(values);
    if (!parsed.success) return invalid(parsed.error);
    const photo = await formFile(form, 'photo');
    if (photo) {
      try {
        await checkUpload(photo.bytes, 'photo');
      } catch (err) {
        if (!(err instanceof AppError)) throw err;
        if (err.code === 'payload_too_large') await hit(publicFormLimit(), addressKey);
        const problem = uploadProblem(t, err);
        return { ok: false, form: kind, code: err.code, message: `${problem} ${t('nothingSentYet')}`, fields: { photo: problem }, values };
      }
    }
    store = () => createDamageReport({ ...common, ...parsed.data, photo, reportedBy: args.userId });
  }

  const waitHere = await hit(publicFormLimit(), addressKey);
  if (waitHere) return tooMany(t, kind, waitHere, false, values);
  const waitBin = await hit(publicBinFormLimit(), binKey);
  if (waitBin) return tooMany(t, kind, waitBin, true, values);
  const created = await store();
  return { ok: true, form: kind, delivery: created.delivery };
}
