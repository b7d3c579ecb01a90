// One way for the portal's form posts (post/redirect/get, no script needed): read the multipart form within its cap,
// check the fields with the page's schema, act, and answer with where to go next — or the form again with the note
// for each field and the status of the refusal (never a 500 for bad input, nothing stored).
import type { ZodType, ZodTypeDef } from 'zod';
import { AppError, ERROR_STATUS } from '@/lib/api-errors';
import { readForm } from '@/lib/attachments.server';
import { fieldProblems, MULTI_FIELDS, pickTextFields } from './portal-forms';

export type PortalPost = { ok: true; redirect: string } | { ok: false; status: number; message: string; problems: Record<string, string>; values: Record<string, string> };

export async function portalPost<T>(
  request: Request,
  fields: readonly string[],
  schema: ZodType<T, ZodTypeDef, unknown>,
  act: (data: T, form: FormData) => Promise<string>,
): Promise<PortalPost> {
  let form: FormData;
  try {
    form = await readForm(request);
  } catch (err) {
    if (err instanceof AppError) return { ok: false, status: ERROR_STATUS[err.code], message: err.message, problems: {}, values: {} };
    throw err;
  }
  const values = pickTextFields(fields, form.entries());
  for (const f of MULTI_FIELDS) {
    if (!fields.includes(f)) continue;
    const all = form.getAll(f).filter((v): v is string => typeof v === 'string');
    if (all.length) values[f] = all.join(',');
  }
  const parsed = schema.safeParse(values);
  if (!parsed.success) {
    return { ok: false, status: 400, message: 'Some answers need another look: see the notes beside them. Nothing was sent yet.', problems: fieldProblems(parsed.error), values };
  }
  try {
    return { ok: true, redirect: await act(parsed.data, form) };
  } catch (err) {
    if (!(err instanceof AppError)) throw err;
    const problems: Record<string, string> = {};
    if (Array.isArray(err.details)) for (const d of err.details as Array<{ path?: string; message?: string }>) if (d.path && d.message) problems[d.path] ??= d.message;
    return { ok: false, status: ERROR_STATUS[err.code], message: `${err.message} Nothing was sent yet.`, problems, values };
  }
}
