import { useMemo, useState, type FormEvent } from 'react';
import { Dialog, FieldProblem } from '@/components/ui/Dialog';
import { Icon } from '@/components/ui/Icon';
import { api, ApiError } from '@/lib/api.client';
import { BIN_TYPES, CUSTOMERS, SITES, TRAILERS, unCodeMeaning, type FieldSpec, type SetupKind, type SetupSpec } from '@/lib/pool-setup/setup-forms';

type Row = { id: number; version: number; active: boolean } & Record<string, unknown>;
type Owner = { id: number; name: string; kind: 'operator' | 'customer' };
type Flash = { tone: 'good' | 'attention' | 'fault'; text: string };

const SPECS = { customers: CUSTOMERS, sites: SITES, 'bin-types': BIN_TYPES, trailers: TRAILERS } as unknown as Record<SetupKind, SetupSpec<Row>>;
const NUMERIC = new Set(['int', 'decimal']);
const FROM_CLASS = { lg: 'hidden lg:table-cell', xl: 'hidden xl:table-cell', '2xl': 'hidden 2xl:table-cell' } as const;

function getPath(o: Record<string, unknown>, path: string): unknown {
  return path.split('.').reduce<unknown>((v, k) => (v && typeof v === 'object' ? (v as Record<string, unknown>)[k] : undefined), o);
}
function setPath(o: Record<string, unknown>, path: string, value: unknown) {
  const keys = path.split('.');
  let at = o;
  for (const k of keys.slice(0, -1)) at = (at[k] ??= {}) as Record<string, unknown>;
  at[keys[keys.length - 1]!] = value;
}

/** What the form holds (strings and booleans) → the body the API parses. A number field that is not a number is sent as typed, so the server's message names it. */
function toBody(fields: FieldSpec[], values: Record<string, string | boolean>) {
  const body: Record<string, unknown> = {};
  for (const f of fields) {
    const v = values[f.name];
    if (f.type === 'checkbox') setPath(body, f.name, Boolean(v));
    else if (f.nullable && String(v ?? '').trim() === '') setPath(body, f.name, null);
    else if (NUMERIC.has(f.type)) {
      const s = String(v ?? '')
        .trim()
        .replace(',', '.');
      setPath(body, f.name, s !== '' && Number.isFinite(Number(s)) ? Number(s) : s);
    } else if (f.name === 'organisationId') setPath(body, f.name, Number(v));
    else setPath(body, f.name, typeof v === 'string' ? v : '');
  }
  return body;
}

function initialValues(fields: FieldSpec[], row: Row | null, owners: Owner[], preset: Record<string, string>) {
  const values: Record<string, string | boolean> = {};
  for (const f of fields) {
    const v = row ? getPath(row, f.name) : undefined;
    if (f.type === 'checkbox') values[f.name] = v === undefined ? f.name === 'active' : Boolean(v);
    else if (v !== undefined && v !== null) values[f.name] = String(v);
    else if (preset[f.name] !== undefined) values[f.name] = preset[f.name]!;
    else if (f.initial !== undefined) values[f.name] = f.initial;
    else if (f.type === 'select' && Array.isArray(f.options)) values[f.name] = f.options[0]!.value;
    else if (f.options === 'owners') values[f.name] = String(owners[0]?.id ?? '');
    else if (f.type === 'currency') values[f.name] = 'EUR';
    else values[f.name] = '';
  }
  return values;
}

function ActiveBadge({ active }: { active: boolean }) {
  return (
    <span className={`inline-flex items-center gap-1.5 whitespace-nowrap font-medium ${active ? 'text-moss' : 'text-ink-soft'}`} data-active={active}>
      <Icon name={active ? 'check' : 'retired'} size={16} /> {active ? 'In use' : 'Closed'}
    </span>
  );
}

function RecordDialog({
  spec,
  kind,
  row,
  owners,
  preset,
  onClose,
  onSaved,
}: {
  spec: SetupSpec<Row>;
  kind: SetupKind;
  row: Row | null;
  owners: Owner[];
  preset: Record<string, string>;
  onClose: () => void;
  onSaved: (row: Row, text: string) => void;
}) {
  const fields = spec.fields.filter((f) => !f.only || f.only === (row ? 'edit' : 'create'));
  const [values, setValues] = useState<Record<string, string | boolean>>(() => ({ ...initialValues(fields, row, owners, preset), active: row ? row.active : true }));
  const [problems, setProblems] = useState<Record<string, string>>({});
  const [error, setError] = useState<{ text: string; stale: boolean } | null>(null);
  const [busy, setBusy] = useState(false);
  const prefix = `${kind}-f`;
  const fid = (name: string) => `${prefix}-${name.replace(/\./g, '-')}`;
  const set = (name: string, v: string | boolean) => setValues((s) => ({ ...s, [name]: v }));

  function ownerOptions() {
    const siteKind = String(values.kind ?? '');
    const wanted = siteKind === 'customer' ? 'customer' : 'operator';
    return owners.filter((o) => o.kind === wanted).map((o) => ({ value: String(o.id), label: o.name }));
  }

  async function submit(e: FormEvent) {
    e.preventDefault();
    setBusy(true);
    setError(null);
    setProblems({});
    const body = toBody([...fields, { name: 'active', label: '', type: 'checkbox' }], values);
    if (!row) delete body.active;
    try {
      const res = row
        ? await api.patch<{ row: Row }>(`${spec.apiBase}/${row.id}`, { ...changedOnly(body, row), version: row.version })
        : await api.post<{ row: Row }>(spec.apiBase, body);
      onSaved(res.row, row ? `${spec.label(res.row)} saved.` : `${spec.label(res.row)} added.`);
    } catch (err) {
      if (err instanceof ApiError) {
        const fm = err.fieldMessages();
        setProblems(fm);
        const marked = Object.keys(fm).some((k) => k !== '');
        setError({ text: err.code === 'validation_failed' && marked ? 'Check the fields marked below.' : err.message, stale: err.code === 'changed_meanwhile' });
      } else setError({ text: 'Something went wrong. Try again.', stale: false });
      setBusy(false);
    }
  }

  const title = row ? `Change ${spec.label(row)}` : `New ${spec.noun}`;
  return (
    <Dialog title={title} labelId={`${prefix}-title`} onClose={onClose}>
      <form className="grid gap-4 sm:grid-cols-2" onSubmit={submit} noValidate id={`${kind}-form`}>
        {error && (
          <p className={`${error.stale ? 'notice-attention' : 'notice-fault'} sm:col-span-2`} role="alert" id={`${kind}-form-error`}>
            {error.text}
            {error.stale && (
              <button type="button" className="ml-2 underline" onClick={() => window.location.reload()}>
                Reload
              </button>
            )}
          </p>
        )}
        {fields.map((f, i) => {
          const next = fields[i + 1];
          const wide = !f.pair && !next?.pair;
          const id = fid(f.name);
          const problem = problems[f.name];
          const describedBy = `${id}-hint ${id}-problem`;
          const common = { id, 'aria-invalid': Boolean(problem), 'aria-describedby': describedBy } as const;
          const value = String(values[f.name] ?? '');
          const options = f.options === 'owners' ? ownerOptions() : f.options;
          const meaning = f.name === 'unCode' ? unCodeMeaning(value) : undefined;
          if (f.type === 'checkbox') {
            return (
              <div key={f.name} className={wide ? 'sm:col-span-2' : ''}>
                {f.group && <h3 className="mb-2 border-t border-paper-line pt-3 text-base font-semibold sm:col-span-2">{f.group}</h3>}
                <label className="flex min-h-touch items-start gap-3 text-sm">
                  <input type="checkbox" className="mt-0.5 h-5 w-5 accent-kelp" {...common} checked={Boolean(values[f.name])} onChange={(e) => set(f.name, e.target.checked)} />
                  <span>
                    <span className="font-medium">{f.label}</span>
                    {f.hint && (
                      <span className="block text-ink-soft" id={`${id}-hint`}>
                        {f.hint}
                      </span>
                    )}
                  </span>
                </label>
                <FieldProblem id={`${id}-problem`} message={problem} />
              </div>
            );
          }
          return (
            <div key={f.name} className={wide ? 'sm:col-span-2' : ''}>
              {f.group && <h3 className="mb-2 border-t border-paper-line pt-3 text-base font-semibold sm:col-span-2">{f.group}</h3>}
              <label className="label" htmlFor={id}>
                {f.label}
                {f.unit ? ` (${f.unit})` : ''}
                {f.nullable ? ' — optional' : ''}
              </label>
              {options ? (
                <select {...common} className="field" value={value} onChange={(e) => set(f.name, e.target.value)}>
                  {options.map((o) => (
                    <option key={o.value} value={o.value}>
                      {o.label}
                    </option>
                  ))}
                </select>
              ) : f.type === 'textarea' ? (
                <textarea {...common} className="field min-h-[4.5rem] py-2" value={value} onChange={(e) => set(f.name, e.target.value)} maxLength={500} />
              ) : (
                <input
                  {...common}
                  className={`field ${f.type === 'code' || f.type === 'currency' ? 'ident uppercase' : ''} ${NUMERIC.has(f.type) || f.type === 'money' ? 'num' : ''}`}
                  type={f.type === 'email' ? 'email' : 'text'}
                  inputMode={f.type === 'int' ? 'numeric' : NUMERIC.has(f.type) || f.type === 'money' ? 'decimal' : undefined}
                  value={value}
                  onChange={(e) => set(f.name, e.target.value)}
                  autoComplete="off"
                />
              )}
              {(f.hint || meaning) && (
                <p className="mt-1 text-sm text-ink-soft" id={`${id}-hint`}>
                  {meaning ?? f.hint}
                </p>
              )}
              <FieldProblem id={`${id}-problem`} message={problem} />
            </div>
          );
        })}
        {row && (
          <div className="sm:col-span-2">
            <label className="flex min-h-touch items-start gap-3 text-sm">
              <input type="checkbox" className="mt-0.5 h-5 w-5 accent-kelp" id={fid('active')} checked={Boolean(values.active)} onChange={(e) => set('active', e.target.checked)} />
              <span>
                <span className="font-medium">In use</span>
                <span className="block text-ink-soft">{spec.activeHint}</span>
              </span>
            </label>
            <FieldProblem id={`${fid('active')}-problem`} message={problems.active} />
          </div>
        )}
        <div className="flex flex-wrap justify-end gap-3 sm:col-span-2">
          <button type="button" className="btn-quiet" onClick={onClose}>
            Cancel
          </button>
          <button type="submit" className="btn-primary" disabled={busy} id={`${kind}-save`}>
            {busy ? 'Saving…' : row ? 'Save changes' : `Add ${spec.noun}`}
          </button>
        </div>
      </form>
    </Dialog>
  );
}

/** Only the fields the admin changed go in a PATCH (the service checks the rest on the merged row). */
function changedOnly(body: Record<string, unknown>, row: Row) {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(body)) if ((row[k] ?? null) !== v) out[k] = v;
  return out;
}

export interface SetupAdminProps {
  kind: SetupKind;
  /** The page's rows (customers, sites or bin types): each has an id, a version and an active flag. */
  initialRows: ReadonlyArray<{ id: number; version: number; active: boolean }>;
  owners?: Owner[];
  /** The filter chosen when the page opened (e.g. ?kind=depot). */
  initialFilter?: string;
}

/** A set-up list (customers, sites, bin types): find, filter, add, change; one dialog for both. */
export default function SetupAdmin({ kind, initialRows, owners = [], initialFilter = '' }: SetupAdminProps) {
  const spec = SPECS[kind];
  const [rows, setRows] = useState(initialRows as Row[]);
  const [query, setQuery] = useState('');
  const [filter, setFilter] = useState(initialFilter);
  const [showClosed, setShowClosed] = useState(false);
  const [dialog, setDialog] = useState<{ row: Row | null } | null>(null);
  const [flash, setFlash] = useState<Flash | null>(null);

  const visible = useMemo(() => {
    const q = query.trim().toLowerCase();
    return rows.filter((r) => (showClosed || r.active) && (!filter || !spec.filter || r[spec.filter.field] === filter) && (!q || spec.search(r).toLowerCase().includes(q)));
  }, [rows, query, filter, showClosed, spec]);
  const closed = rows.filter((r) => !r.active).length;
  const preset = filter && spec.filter ? { [spec.filter.field]: filter } : {};

  return (
    <div>
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div className="max-w-3xl">
          <h1>{spec.title}</h1>
          <p className="mt-1 text-ink-soft">{spec.intro}</p>
        </div>
        <button type="button" className="btn-primary" id={`${kind}-new`} onClick={() => setDialog({ row: null })}>
          <Icon name="plusBox" /> New {spec.noun}
        </button>
      </div>

      {flash && (
        <div className={`notice-${flash.tone} mt-4 flex items-start justify-between gap-4`} role="status" id={`${kind}-flash`}>
          <span>{flash.text}</span>
          <button type="button" className="shrink-0 underline" onClick={() => setFlash(null)}>
            Dismiss
          </button>
        </div>
      )}

      <div className="mt-6 flex flex-wrap items-end gap-3" role="search">
        <div className="min-w-[14rem] flex-1">
          <label className="label" htmlFor={`${kind}-search`}>
            Find
          </label>
          <input id={`${kind}-search`} className="field" type="search" value={query} onChange={(e) => setQuery(e.target.value)} />
        </div>
        {spec.filter && (
          <div>
            <label className="label" htmlFor={`${kind}-filter`}>
              {spec.filter.label}
            </label>
            <select id={`${kind}-filter`} className="field" value={filter} onChange={(e) => setFilter(e.target.value)}>
              <option value="">All</option>
              {spec.filter.options.map((o) => (
                <option key={o.value} value={o.value}>
                  {o.label}
                </option>
              ))}
            </select>
          </div>
        )}
        <label className="flex min-h-touch items-center gap-2 text-sm">
          <input type="checkbox" className="h-5 w-5 accent-kelp" checked={showClosed} onChange={(e) => setShowClosed(e.target.checked)} />
          Show closed ({closed})
        </label>
      </div>

      <p className="mt-4 text-sm text-ink-soft" aria-live="polite" id={`${kind}-count`}>
        {visible.length} of {rows.length}
      </p>

      {visible.length === 0 ? (
        <div className="card mt-2 p-6 text-ink-soft">Nothing matches. Clear the search or the filter, or add a new {spec.noun}.</div>
      ) : (
        <>
          <div className="card mt-2 hidden overflow-x-auto md:block" tabIndex={0} role="region" aria-label={`${spec.title} (the table scrolls sideways)`}>
            <table className="w-full text-left text-sm" id={`${kind}-table`}>
              <thead className="border-b border-paper-line bg-paper text-ink-soft">
                <tr>
                  {spec.columns.map((c, i) => (
                    <th
                      key={c.label}
                      scope="col"
                      className={`px-3 py-2 font-medium ${c.num ? 'text-right' : ''} ${c.from ? FROM_CLASS[c.from] : ''} ${i === 0 ? 'sticky left-0 bg-paper' : ''}`}
                    >
                      {c.label}
                    </th>
                  ))}
                  <th scope="col" className="px-3 py-2 font-medium">
                    Status
                  </th>
                  <th scope="col" className="px-3 py-2">
                    <span className="sr-only">Actions</span>
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-paper-line">
                {visible.map((r) => (
                  <tr key={r.id} data-row={spec.label(r)} className={r.active ? '' : 'bg-paper/60'}>
                    {spec.columns.map((c, i) => (
                      <td
                        key={c.label}
                        className={`px-3 py-2.5 ${c.ident ? 'ident whitespace-nowrap' : ''} ${c.num ? 'num text-right whitespace-nowrap' : ''} ${c.from ? FROM_CLASS[c.from] : ''} ${i === 0 ? 'sticky left-0 bg-card font-medium' : ''}`}
                      >
                        {c.value(r)}
                      </td>
                    ))}
                    <td className="px-3 py-2.5">
                      <ActiveBadge active={r.active} />
                    </td>
                    <td className="px-3 py-2.5 text-right">
                      <button type="button" className="btn-quiet h-9 min-h-0 px-3 text-sm" onClick={() => setDialog({ row: r })} aria-label={`Change ${spec.label(r)}`}>
                        Change
                      </button>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>

          <ul className="mt-2 space-y-3 md:hidden">
            {visible.map((r) => (
              <li key={r.id} className="card p-4" data-row={spec.label(r)}>
                <div className="flex items-start justify-between gap-3">
                  <div className={`min-w-0 font-medium ${spec.columns[0]!.ident ? 'ident' : ''}`}>{spec.columns[0]!.value(r)}</div>
                  <ActiveBadge active={r.active} />
                </div>
                <dl className="mt-3 grid grid-cols-[8rem_1fr] gap-x-3 gap-y-1 text-sm">
                  {spec.columns.slice(1).map((c) => (
                    <div key={c.label} className="contents">
                      <dt className="text-ink-soft">{c.label}</dt>
                      <dd className={c.num ? 'num' : ''}>{c.value(r)}</dd>
                    </div>
                  ))}
                </dl>
                <button type="button" className="btn-quiet mt-3 w-full" onClick={() => setDialog({ row: r })} aria-label={`Change ${spec.label(r)}`}>
                  Change
                </button>
              </li>
            ))}
          </ul>
        </>
      )}

      {dialog && (
        <RecordDialog
          spec={spec}
          kind={kind}
          row={dialog.row}
          owners={owners}
          preset={preset}
          onClose={() => setDialog(null)}
          onSaved={(row, text) => {
            setRows((list) => (list.some((x) => x.id === row.id) ? list.map((x) => (x.id === row.id ? row : x)) : [...list, row]));
            setFlash({ tone: 'good', text });
            setDialog(null);
          }}
        />
      )}
    </div>
  );
}
