import { useEffect, useMemo, useState, type FormEvent } from 'react';
import { api, ApiError } from '@/lib/api.client';
import { groupGrai, parseSerialisedGrai } from '@/lib/gs1';
import { checkMarkAgainstType, graiFromSerial, isMonth } from '@/lib/bins/registration-check';
import { decodeUnMark } from '@/lib/bins/un-mark-summary';
import { inspectionLabel, nextDue } from '@/lib/inspections/inspection-due';
import { policyForBinType } from '@/lib/bins/bin-policy';
import { formatLongDate } from '@/lib/calendar';
import { STATUS_LABELS } from '@/lib/scans/lifecycle';
import type { FormOptions, BinTypeOption } from '@/lib/bins/bin-forms.server';
import type { EditableBin } from '@/lib/bins/bin-edit.server';
import { FormField, describedBy } from './FormField';
import { UnMarkPanel } from './UnMarkPanel';
import { Icon } from '@/components/ui/Icon';

interface Fields {
  graiMode: 'grai' | 'serial';
  grai: string;
  serial: string;
  binTypeId: string;
  siteId: string;
  manufactureMonth: string;
  unMarking: string;
  lastIntermediateTestMonth: string;
  lastFullInspectionMonth: string;
  innerMadeMonth: string;
}

type Problems = Record<string, string>;

const FIELD_NAMES: Record<string, string> = {
  grai: 'GRAI',
  serial: 'Serial',
  binTypeId: 'Bin type',
  siteId: 'Depot',
  manufactureMonth: 'Month of manufacture',
  unMarking: 'UN mark',
  lastIntermediateTestMonth: 'Last intermediate test',
  lastFullInspectionMonth: 'Last full inspection',
  innerMadeMonth: 'Inner receptacle made',
};

function initialFields(options: FormOptions, bin?: EditableBin): Fields {
  return {
    graiMode: 'grai',
    grai: '',
    serial: '',
    binTypeId: String(bin?.binTypeId ?? (options.binTypes.length === 1 ? options.binTypes[0]!.id : '')),
    siteId: options.depots.length === 1 ? String(options.depots[0]!.id) : '',
    manufactureMonth: bin?.manufactureMonth ?? '',
    unMarking: bin?.unMarking ?? '',
    lastIntermediateTestMonth: bin?.lastIntermediateTestMonth ?? '',
    lastFullInspectionMonth: bin?.lastFullInspectionMonth ?? '',
    innerMadeMonth: bin?.innerMadeMonth ?? '',
  };
}

/** Due dates the bin would get, through the same policy code the server uses; null until the months read. */
function duePreview(type: BinTypeOption | undefined, f: Fields) {
  if (!type || !isMonth(f.manufactureMonth)) return null;
  const tests = [f.lastIntermediateTestMonth, f.lastFullInspectionMonth];
  if (tests.some((m) => m !== '' && (!isMonth(m) || m < f.manufactureMonth))) return null;
  const policy = policyForBinType(type);
  try {
    const due = nextDue(
      { manufactureMonth: f.manufactureMonth, lastIntermediateTestMonth: f.lastIntermediateTestMonth || null, lastFullInspectionMonth: f.lastFullInspectionMonth || null },
      policy,
    );
    return { ...due, label: inspectionLabel(due.nextKind, policy) };
  } catch {
    return null;
  }
}

function testLabels(type: BinTypeOption | undefined) {
  const policy = type ? policyForBinType(type) : null;
  return {
    intermediate: policy ? `Last ${inspectionLabel('intermediate', policy)} test (month)` : 'Last intermediate test (month)',
    full: policy ? `Last ${inspectionLabel('full', policy)} inspection (month)` : 'Last full inspection (month)',
  };
}

interface Registered {
  grai: string;
  groupedGrai: string;
  nextDue: string | null;
}

/** Register one bin (no `bin`) or correct a registered one (`bin` given). */
export default function BinForm({ options, bin }: { options: FormOptions; bin?: EditableBin }) {
  const editing = Boolean(bin);
  const [fields, setFields] = useState<Fields>(() => initialFields(options, bin));
  const [version, setVersion] = useState(bin?.version ?? 0);
  const [problems, setProblems] = useState<Problems>({});
  const [notice, setNotice] = useState<{ tone: 'good' | 'fault' | 'attention'; text: string; stale?: boolean } | null>(null);
  const [registered, setRegistered] = useState<Registered | null>(null);
  const [markFilledMonth, setMarkFilledMonth] = useState(false);
  const [busy, setBusy] = useState(false);
  // Rendered disabled on the server: typing before the page's script runs would be lost.
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);

  const type = options.binTypes.find((t) => String(t.id) === fields.binTypeId);
  const mark = useMemo(() => (fields.unMarking.trim() ? decodeUnMark(fields.unMarking) : null), [fields.unMarking]);
  const markMonth = mark?.ok ? mark.manufactureMonth : null;
  const typeWarning = type && mark?.ok ? (checkMarkAgainstType(fields.unMarking, type)?.message ?? null) : null;
  const due = duePreview(type, fields);
  const labels = testLabels(type);

  // A mark that reads carries the month of manufacture: fill it in.
  useEffect(() => {
    if (!markMonth) return;
    setFields((f) => (f.manufactureMonth === markMonth ? f : { ...f, manufactureMonth: markMonth }));
    setMarkFilledMonth(true);
  }, [markMonth]);

  const graiCheck = fields.graiMode === 'grai' && fields.grai.trim() !== '' ? parseSerialisedGrai(fields.grai, { companyPrefixLength: options.prefixLength }) : null;
  const built = fields.graiMode === 'serial' && type && fields.serial.trim() !== '' ? graiFromSerial(options.companyPrefix, type.graiAssetType, fields.serial) : null;

  const set = (key: keyof Fields) => (e: { target: { value: string } }) => {
    const value = e.target.value;
    setFields((f) => ({ ...f, [key]: value }));
    if (key === 'manufactureMonth') setMarkFilledMonth(false);
    // The server's word on a field holds until the field is changed.
    setProblems((p) => {
      if (!(key in p)) return p;
      const rest = { ...p };
      delete rest[key];
      return rest;
    });
  };

  async function submit(e: FormEvent) {
    e.preventDefault();
    setBusy(true);
    setNotice(null);
    setProblems({});
    const common = {
      binTypeId: fields.binTypeId === '' ? 0 : Number(fields.binTypeId),
      manufactureMonth: fields.manufactureMonth,
      unMarking: fields.unMarking,
      lastIntermediateTestMonth: fields.lastIntermediateTestMonth,
      lastFullInspectionMonth: fields.lastFullInspectionMonth,
      innerMadeMonth: fields.innerMadeMonth,
    };
    try {
      if (bin) {
        const result = await api.patch<{ changed: boolean; version: number; nextDue: string | null }>(`/api/bins/${encodeURIComponent(bin.grai)}/edit`, { ...common, version });
        setVersion(result.version);
        setNotice(
          result.changed
            ? { tone: 'good', text: `Saved.${result.nextDue ? ` Next test due ${formatLongDate(result.nextDue)}.` : ''}` }
            : { tone: 'good', text: 'Nothing had changed, so nothing was saved.' },
        );
      } else {
        const result = await api.post<Registered>('/api/bins/register', {
          ...common,
          graiMode: fields.graiMode,
          grai: fields.grai,
          serial: fields.serial,
          siteId: fields.siteId === '' ? 0 : Number(fields.siteId),
        });
        setRegistered(result);
      }
    } catch (err) {
      if (err instanceof ApiError) {
        const byField = err.fieldMessages();
        setProblems(byField);
        const fieldCount = Object.keys(byField).filter((k) => FIELD_NAMES[k]).length;
        setNotice({
          tone: err.code === 'changed_meanwhile' ? 'attention' : 'fault',
          text: err.code === 'validation_failed' && fieldCount ? 'Nothing was saved. Check the fields marked below.' : err.message,
          stale: err.code === 'changed_meanwhile',
        });
      } else setNotice({ tone: 'fault', text: 'Something went wrong. Try again.' });
    }
    setBusy(false);
  }

  function registerAnother() {
    setRegistered(null);
    setFields((f) => ({ ...initialFields(options), binTypeId: f.binTypeId, siteId: f.siteId, graiMode: f.graiMode }));
    setMarkFilledMonth(false);
  }

  if (registered) {
    const href = `/bins/${encodeURIComponent(registered.grai)}`;
    return (
      <div className="card p-6" id="register-done" role="status">
        <p className="flex items-center gap-2 text-lg font-semibold text-moss">
          <Icon name="check" /> Bin registered
        </p>
        <p className="mt-2 ident text-xl" id="registered-grai">
          {registered.groupedGrai}
        </p>
        <p className="mt-1 text-ink-soft">Available at its depot.{registered.nextDue ? ` Next periodic test due ${formatLongDate(registered.nextDue)}.` : ''}</p>
        <div className="mt-5 flex flex-wrap gap-3">
          <a className="btn-primary" href={href}>
            Open the bin page
          </a>
          <a className="btn-quiet" href={`${href}/edit`}>
            Correct it
          </a>
          <button type="button" className="btn-quiet" onClick={registerAnother} id="register-another">
            Register another bin
          </button>
        </div>
      </div>
    );
  }

  const problemList = Object.entries(problems).filter(([k]) => FIELD_NAMES[k]);
  return (
    <form onSubmit={submit} noValidate id="bin-form" className="space-y-6">
      {notice && (
        <div className={`notice-${notice.tone}`} role={notice.tone === 'good' ? 'status' : 'alert'} id="bin-form-notice">
          <p>{notice.text}</p>
          {problemList.length > 0 && (
            <ul className="mt-1 list-disc pl-5">
              {problemList.map(([k, m]) => (
                <li key={k}>
                  <a href={`#f-${k}`} className="text-ink underline">
                    {FIELD_NAMES[k]}
                  </a>
                  : {m}
                </li>
              ))}
            </ul>
          )}
          {notice.stale && (
            <button type="button" className="btn-quiet mt-2" onClick={() => window.location.reload()} id="reload-form">
              Reload the form
            </button>
          )}
        </div>
      )}

      <fieldset className="card space-y-4 p-5" disabled={!ready}>
        <legend className="px-1 text-lg font-semibold">Identity</legend>
        {bin ? (
          <div className="space-y-3">
            <div>
              <p className="label">GRAI</p>
              <p className="ident text-lg" id="fixed-grai">
                {bin.groupedGrai}
              </p>
              <p className="text-sm text-ink-soft">
                Not editable: the GRAI is the bin's identity on its label and in every recorded event. A bin registered under a wrong GRAI is retired and registered again.
              </p>
            </div>
            <div>
              <p className="label">Status</p>
              <p className="font-medium" id="fixed-status">
                {STATUS_LABELS[bin.status]}
                {bin.siteName ? ` · ${bin.siteName}` : ''}
              </p>
              <p className="text-sm text-ink-soft">Not editable here: status and place follow the scan log. Record a scan (receive, quarantine, retire…) to change them.</p>
            </div>
          </div>
        ) : (
          <>
            <div role="radiogroup" aria-label="How to give the GRAI" className="flex flex-wrap gap-x-6 gap-y-2">
              <label className="inline-flex min-h-touch items-center gap-2">
                <input type="radio" name="graiMode" value="grai" checked={fields.graiMode === 'grai'} onChange={set('graiMode')} id="mode-grai" /> Type the full GRAI
              </label>
              <label className="inline-flex min-h-touch items-center gap-2">
                <input type="radio" name="graiMode" value="serial" checked={fields.graiMode === 'serial'} onChange={set('graiMode')} id="mode-serial" /> Build it from the serial
              </label>
            </div>
            {fields.graiMode === 'grai' ? (
              <FormField
                id="f-grai"
                label="GRAI"
                problem={problems.grai}
                hint={
                  graiCheck == null ? (
                    'As printed under the QR label, with or without spaces; a scanned label link works too.'
                  ) : graiCheck.ok ? (
                    <span className="text-moss" id="grai-ok">
                      ✓ Check digit {graiCheck.grai.checkDigit} is right · <span className="ident">{groupGrai(graiCheck.grai.value, options.prefixLength)}</span>
                    </span>
                  ) : problems.grai ? undefined : (
                    <span className="text-brick" id="grai-live-problem">
                      {graiCheck.error.message}
                    </span>
                  )
                }
              >
                <input
                  id="f-grai"
                  className="field ident"
                  value={fields.grai}
                  onChange={set('grai')}
                  autoComplete="off"
                  spellCheck={false}
                  maxLength={300}
                  {...describedBy('f-grai', problems.grai)}
                />
              </FormField>
            ) : (
              <FormField
                id="f-serial"
                label="Serial"
                problem={problems.serial}
                hint={
                  !type ? (
                    'Choose the bin type below first: its GRAI asset type is part of the GRAI.'
                  ) : built == null ? (
                    `GRAI = company prefix ${options.companyPrefix} + asset type ${type.graiAssetType} + check digit + serial.`
                  ) : built.ok ? (
                    <span id="built-grai">
                      GRAI with check digit {built.grai.charAt(13)}: <span className="ident font-medium text-ink">{groupGrai(built.grai, options.prefixLength)}</span>
                    </span>
                  ) : (
                    <span className="text-brick">{built.message}</span>
                  )
                }
              >
                <input
                  id="f-serial"
                  className="field ident"
                  value={fields.serial}
                  onChange={set('serial')}
                  autoComplete="off"
                  spellCheck={false}
                  maxLength={40}
                  {...describedBy('f-serial', problems.serial)}
                />
              </FormField>
            )}
          </>
        )}
        <div className={bin ? '' : 'grid gap-4 sm:grid-cols-2'}>
          <FormField
            id="f-binTypeId"
            label="Bin type"
            problem={problems.binTypeId}
            hint={bin && !bin.binTypeActive && String(bin.binTypeId) === fields.binTypeId ? `${bin.binTypeCode} is no longer in use; the bin may keep it.` : undefined}
          >
            <select id="f-binTypeId" className="field" value={fields.binTypeId} onChange={set('binTypeId')} {...describedBy('f-binTypeId', problems.binTypeId)}>
              <option value="">Choose a bin type…</option>
              {bin && !bin.binTypeActive && <option value={bin.binTypeId}>{bin.binTypeCode} (no longer in use)</option>}
              {options.binTypes.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.code} · {t.name}
                </option>
              ))}
            </select>
          </FormField>
          {!bin && (
            <FormField id="f-siteId" label="Depot" problem={problems.siteId} hint="Where the bin stands now.">
              <select id="f-siteId" className="field" value={fields.siteId} onChange={set('siteId')} {...describedBy('f-siteId', problems.siteId)}>
                <option value="">Choose a depot…</option>
                {options.depots.map((d) => (
                  <option key={d.id} value={d.id}>
                    {d.name} ({d.code})
                  </option>
                ))}
              </select>
            </FormField>
          )}
        </div>
      </fieldset>

      <fieldset className="card space-y-4 p-5" disabled={!ready}>
        <legend className="px-1 text-lg font-semibold">Marking and tests</legend>
        <FormField
          id="f-unMarking"
          label="UN mark (optional)"
          problem={problems.unMarking}
          hint="As stamped on the bin's plate, fields separated by /, e.g. 31HA2/Y/05 24/NL/maker/2313/1285. Leave empty for a bin without a UN mark."
        >
          <input
            id="f-unMarking"
            className="field ident"
            value={fields.unMarking}
            onChange={set('unMarking')}
            autoComplete="off"
            spellCheck={false}
            maxLength={120}
            {...describedBy('f-unMarking', problems.unMarking)}
          />
        </FormField>
        <UnMarkPanel summary={mark} typeWarning={typeWarning} />
        <FormField
          id="f-manufactureMonth"
          label="Month of manufacture"
          problem={problems.manufactureMonth}
          hint={
            markFilledMonth && markMonth === fields.manufactureMonth ? (
              <span id="month-from-mark">Filled in from the UN mark.</span>
            ) : markMonth && markMonth !== fields.manufactureMonth ? (
              <span className="text-brick">The UN mark says {markMonth}.</span>
            ) : (
              "YYYY-MM, as on the bin's plate."
            )
          }
        >
          <input
            id="f-manufactureMonth"
            className="field num sm:max-w-xs"
            type="month"
            placeholder="2024-05"
            value={fields.manufactureMonth}
            onChange={set('manufactureMonth')}
            {...describedBy('f-manufactureMonth', problems.manufactureMonth)}
          />
        </FormField>
        <div className="grid gap-4 sm:grid-cols-2">
          <FormField
            id="f-lastIntermediateTestMonth"
            label={labels.intermediate}
            problem={problems.lastIntermediateTestMonth}
            hint="The last leakproofness test, as marked on the bin (also one done with a 5-year inspection). Leave empty when it has had none."
          >
            <input
              id="f-lastIntermediateTestMonth"
              className="field num"
              type="month"
              placeholder="2026-02"
              value={fields.lastIntermediateTestMonth}
              onChange={set('lastIntermediateTestMonth')}
              {...describedBy('f-lastIntermediateTestMonth', problems.lastIntermediateTestMonth)}
            />
          </FormField>
          <FormField
            id="f-lastFullInspectionMonth"
            label={labels.full}
            problem={problems.lastFullInspectionMonth}
            hint="Optional. It restarts only this clock; if it was done with a leakproofness test, enter that month above too."
          >
            <input
              id="f-lastFullInspectionMonth"
              className="field num"
              type="month"
              placeholder="2025-09"
              value={fields.lastFullInspectionMonth}
              onChange={set('lastFullInspectionMonth')}
              {...describedBy('f-lastFullInspectionMonth', problems.lastFullInspectionMonth)}
            />
          </FormField>
        </div>
        {type?.serviceLifeApplies && (
          <FormField
            id="f-innerMadeMonth"
            label="Inner receptacle made"
            problem={problems.innerMadeMonth}
            hint={`This type's rigid plastics inner receptacle may carry dangerous goods for ${type.serviceLifeYears ?? 5} years from the month it was made (ADR 4.1.1.15). Leave empty when it was made with the bin.`}
          >
            <input
              id="f-innerMadeMonth"
              className="field num sm:max-w-xs"
              type="month"
              placeholder="2024-05"
              value={fields.innerMadeMonth}
              onChange={set('innerMadeMonth')}
              {...describedBy('f-innerMadeMonth', problems.innerMadeMonth)}
            />
          </FormField>
        )}
        <p className="notice-info" id="due-preview">
          {due ? (
            <>
              Next periodic test due <strong>{formatLongDate(due.nextDue)}</strong> ({due.label}); intermediate {formatLongDate(due.intermediateDue)}, full{' '}
              {formatLongDate(due.fullDue)}. Worked out from the bin type's policy.
            </>
          ) : (
            'The due dates appear here once the bin type and month of manufacture are given.'
          )}
        </p>
      </fieldset>

      <div className="flex flex-wrap items-center justify-end gap-3">
        {bin && (
          <a className="btn-quiet" href={`/bins/${encodeURIComponent(bin.grai)}`}>
            Back to the bin
          </a>
        )}
        <button type="submit" className="btn-primary" disabled={busy || !ready} id="bin-form-submit">
          {busy ? 'Saving…' : editing ? 'Save changes' : 'Register bin'}
        </button>
      </div>
    </form>
  );
}
