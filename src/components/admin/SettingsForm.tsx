import { useMemo, useState, type FormEvent, type ReactNode } from 'react';
import { FieldProblem } from '@/components/ui/Dialog';
import { api, ApiError } from '@/lib/api.client';
import { fractionToPercent, percentToFraction } from '@/lib/percent';
import { formatMomentAbsolute } from '@/lib/moment-text';
import type { SettingsView } from '@/lib/settings/settings-schema';
import { LANGUAGE_NAMES, PUBLIC_LANGUAGES, type PublicLanguage } from '@/lib/requests/public-languages';

type Problems = Record<string, string>;

function Field({ id, label, hint, problem, children }: { id: string; label: string; hint?: ReactNode; problem?: string; children: ReactNode }) {
  return (
    <div>
      <label className="label" htmlFor={id}>
        {label}
      </label>
      {children}
      {hint && (
        <p className="mt-1 text-sm text-ink-soft" id={`${id}-hint`}>
          {hint}
        </p>
      )}
      <FieldProblem id={`${id}-problem`} message={problem} />
    </div>
  );
}

/** The operator-wide settings; saved whole, refused when someone else saved first. */
export default function SettingsForm({ initial }: { initial: SettingsView }) {
  const [saved, setSaved] = useState(initial);
  const [form, setForm] = useState(() => ({ ...initial, taxPercent: fractionToPercent(initial.taxRate) ?? '' }));
  const [problems, setProblems] = useState<Problems>({});
  const [notice, setNotice] = useState<{ tone: 'good' | 'fault' | 'attention'; text: string; stale?: boolean } | null>(null);
  const [busy, setBusy] = useState(false);
  const zones = useMemo(() => Intl.supportedValuesOf('timeZone'), []);

  const set =
    <K extends keyof typeof form>(key: K) =>
    (e: { target: { value: string } }) =>
      setForm((f) => ({
        ...f,
        [key]: key === 'gs1PrefixLength' || key === 'undoSeconds' || key === 'reminderDaysOver' || key === 'paymentReminderDays' ? Number(e.target.value) : e.target.value,
      }));
  const setWording = (language: PublicLanguage) => (e: { target: { value: string } }) =>
    setForm((f) => ({ ...f, returnInstructionsByLanguage: { ...f.returnInstructionsByLanguage, [language]: e.target.value } }));
  const aria = (name: string) => ({ 'aria-invalid': Boolean(problems[name]), 'aria-describedby': `s-${name}-hint s-${name}-problem` });

  async function submit(e: FormEvent) {
    e.preventDefault();
    setNotice(null);
    const taxRate = percentToFraction(form.taxPercent);
    if (taxRate === null) {
      setProblems({ taxRate: 'A percentage from 0 to 99.99, with at most two decimals.' });
      return;
    }
    setBusy(true);
    setProblems({});
    try {
      const { taxPercent: _ignored, updatedAt: _u, ...rest } = form;
      const { settings } = await api.put<{ settings: SettingsView }>('/api/admin/settings', { ...rest, taxRate });
      setSaved(settings);
      setForm({ ...settings, taxPercent: fractionToPercent(settings.taxRate) ?? '' });
      setNotice({ tone: 'good', text: 'Settings saved.' });
    } catch (err) {
      if (err instanceof ApiError) {
        setProblems(err.fieldMessages());
        const text = err.code === 'validation_failed' && Object.keys(err.fieldMessages()).length ? 'Check the fields marked below.' : err.message;
        setNotice({ tone: err.code === 'changed_meanwhile' ? 'attention' : 'fault', text, stale: err.code === 'changed_meanwhile' });
      } else setNotice({ tone: 'fault', text: 'Something went wrong. Try again.' });
    }
    setBusy(false);
  }

  return (
    <form onSubmit={submit} noValidate id="settings-form" className="space-y-6">
      {notice && (
        <div className={`notice-${notice.tone}`} role={notice.tone === 'good' ? 'status' : 'alert'} id="settings-notice">
          {notice.text}
          {notice.stale && (
            <button type="button" className="ml-2 underline" onClick={() => window.location.reload()}>
              Reload
            </button>
          )}
        </div>
      )}

      <fieldset className="card space-y-4 p-5">
        <legend className="px-1 text-lg font-semibold">Operator</legend>
        <Field id="s-operatorName" label="Operator name" hint="Shown in e-mails and on the public bin page." problem={problems.operatorName}>
          <input id="s-operatorName" className="field" value={form.operatorName} onChange={set('operatorName')} maxLength={160} {...aria('operatorName')} />
        </Field>
        <Field id="s-mailSender" label="Mail sender" hint="The From of every e-mail, e.g. Pool desk <pool@company.example>." problem={problems.mailSender}>
          <input id="s-mailSender" className="field" value={form.mailSender} onChange={set('mailSender')} maxLength={254} {...aria('mailSender')} />
        </Field>
        <Field id="s-returnInstructions" label="Return instructions" hint="Shown to anyone who scans a bin's label: how to return it." problem={problems.returnInstructions}>
          <textarea
            id="s-returnInstructions"
            className="field min-h-[7rem] py-2"
            value={form.returnInstructions}
            onChange={set('returnInstructions')}
            maxLength={2000}
            {...aria('returnInstructions')}
          />
        </Field>
        <details className="rounded-md border border-paper-line p-3" data-wording-by-language>
          <summary className="cursor-pointer font-medium">Return instructions in the finder's language</summary>
          <p className="mt-1 text-sm text-ink-soft">
            The public bin page answers in the visitor's language. Write your own instructions for a language here; where one is left empty, the instructions above are shown.
          </p>
          <div className="mt-3 space-y-3">
            {PUBLIC_LANGUAGES.map((l) => (
              <Field key={l} id={`s-returnInstructions-${l}`} label={LANGUAGE_NAMES[l]} problem={problems[`returnInstructionsByLanguage.${l}`]}>
                <textarea
                  id={`s-returnInstructions-${l}`}
                  lang={l}
                  className="field min-h-[4rem] py-2"
                  value={form.returnInstructionsByLanguage[l] ?? ''}
                  onChange={setWording(l)}
                  maxLength={2000}
                  aria-invalid={Boolean(problems[`returnInstructionsByLanguage.${l}`])}
                  aria-describedby={`s-returnInstructions-${l}-problem`}
                />
              </Field>
            ))}
          </div>
        </details>
      </fieldset>

      <fieldset className="card space-y-4 p-5">
        <legend className="px-1 text-lg font-semibold">Bin identity</legend>
        <div className="grid gap-4 sm:grid-cols-[1fr_10rem]">
          <Field
            id="s-gs1CompanyPrefix"
            label="GS1 company prefix"
            hint={`Digits typed: ${form.gs1CompanyPrefix.length}. New GRAIs start with it.`}
            problem={problems.gs1CompanyPrefix}
          >
            <input
              id="s-gs1CompanyPrefix"
              className="field ident"
              inputMode="numeric"
              value={form.gs1CompanyPrefix}
              onChange={set('gs1CompanyPrefix')}
              maxLength={12}
              {...aria('gs1CompanyPrefix')}
            />
          </Field>
          <Field id="s-gs1PrefixLength" label="Prefix length" problem={problems.gs1PrefixLength}>
            <input
              id="s-gs1PrefixLength"
              className="field num"
              type="number"
              min={4}
              max={12}
              value={form.gs1PrefixLength}
              onChange={set('gs1PrefixLength')}
              {...aria('gs1PrefixLength')}
            />
          </Field>
        </div>
        <Field
          id="s-digitalLinkBase"
          label="Digital Link base address"
          hint="QR labels encode this address followed by /8003/ and the bin's GRAI."
          problem={problems.digitalLinkBase}
        >
          <input
            id="s-digitalLinkBase"
            className="field ident"
            type="url"
            value={form.digitalLinkBase}
            onChange={set('digitalLinkBase')}
            maxLength={200}
            {...aria('digitalLinkBase')}
          />
        </Field>
      </fieldset>

      <fieldset className="card space-y-4 p-5">
        <legend className="px-1 text-lg font-semibold">Time and money</legend>
        <Field id="s-timeZone" label="Time zone" hint="Day counts, due dates and hire days use this zone." problem={problems.timeZone}>
          <input id="s-timeZone" className="field" list="time-zones" value={form.timeZone} onChange={set('timeZone')} autoComplete="off" {...aria('timeZone')} />
          <datalist id="time-zones">
            {zones.map((z) => (
              <option key={z} value={z} />
            ))}
          </datalist>
        </Field>
        <div className="grid gap-4 sm:grid-cols-2">
          <Field id="s-currency" label="Currency" hint="ISO 4217 code, e.g. EUR." problem={problems.currency}>
            <input id="s-currency" className="field ident uppercase" value={form.currency} onChange={set('currency')} maxLength={3} {...aria('currency')} />
          </Field>
          <Field id="s-taxRate" label="Tax rate (%)" hint="Added to hire statements." problem={problems.taxRate}>
            <input id="s-taxRate" className="field num" inputMode="decimal" value={form.taxPercent} onChange={set('taxPercent')} {...aria('taxRate')} />
          </Field>
        </div>
      </fieldset>

      <fieldset className="card space-y-4 p-5">
        <legend className="px-1 text-lg font-semibold">Scanning</legend>
        <Field
          id="s-undoSeconds"
          label="Time to undo a scan (seconds)"
          hint="After recording, the person who scanned may undo it for this long while nothing later is recorded on the bin; it is kept as a void. 0 turns undo off. Planners void anything else with a reason."
          problem={problems.undoSeconds}
        >
          <input
            id="s-undoSeconds"
            className="field num max-w-[10rem]"
            type="number"
            min={0}
            max={600}
            value={form.undoSeconds}
            onChange={set('undoSeconds')}
            {...aria('undoSeconds')}
          />
        </Field>
      </fieldset>

      <fieldset className="card space-y-4 p-5">
        <legend className="px-1 text-lg font-semibold">Customer mail</legend>
        <Field
          id="s-reminderDaysOver"
          label="Overdue-return reminder after (days over the free days)"
          hint="A bin is listed in its customer's reminder once it is this many days past the free days. Each person gets at most one reminder a week, listing all their overdue bins; anyone may turn reminders off on their account page."
          problem={problems.reminderDaysOver}
        >
          <input
            id="s-reminderDaysOver"
            className="field num max-w-[10rem]"
            type="number"
            min={1}
            max={365}
            value={form.reminderDaysOver}
            onChange={set('reminderDaysOver')}
            {...aria('reminderDaysOver')}
          />
        </Field>
        <Field
          id="s-paymentReminderDays"
          label="Payment reminder after (days past the due date)"
          hint="An invoice still open this many days after its due date goes in a reminder to the customer's contact address, then once a week while it stays open."
          problem={problems.paymentReminderDays}
        >
          <input
            id="s-paymentReminderDays"
            className="field num max-w-[10rem]"
            type="number"
            min={1}
            max={90}
            value={form.paymentReminderDays}
            onChange={set('paymentReminderDays')}
            {...aria('paymentReminderDays')}
          />
        </Field>
      </fieldset>

      <fieldset className="card space-y-4 p-4">
        <legend className="px-1 text-lg font-semibold">Repairs</legend>
        <Field
          id="s-repairRetireThreshold"
          label={`Propose retirement above (${form.currency})`}
          hint="A bin whose repair would cost more than this — the estimate or the cost already spent — is proposed for retirement on its repair order. Leave it empty to never propose it."
          problem={problems.repairRetireThreshold}
        >
          <input
            id="s-repairRetireThreshold"
            className="field num max-w-[10rem]"
            inputMode="decimal"
            value={form.repairRetireThreshold ?? ''}
            onChange={set('repairRetireThreshold')}
            {...aria('repairRetireThreshold')}
          />
        </Field>
      </fieldset>

      <div className="flex flex-wrap items-center justify-between gap-3">
        <p className="text-sm text-ink-soft">
          Last saved {formatMomentAbsolute(saved.updatedAt, saved.timeZone)} ({saved.timeZone})
        </p>
        <button type="submit" className="btn-primary" disabled={busy} id="settings-save">
          {busy ? 'Saving…' : 'Save settings'}
        </button>
      </div>
    </form>
  );
}
