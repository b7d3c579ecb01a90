import { useMemo, useState, type FormEvent } from 'react';
import { Dialog, FieldProblem } from '@/components/ui/Dialog';
import { Icon } from '@/components/ui/Icon';
import { api, ApiError } from '@/lib/api.client';
import { VALVE_TYPES, VALVE_TYPE_LABEL, describeSpec } from '@/lib/liners/liner-specs';
import type { SpecRow, SupplierRow } from '@/lib/liners/liner-specs.server';

type Kind = 'specs' | 'suppliers';
type Row = (SpecRow | SupplierRow) & Record<string, unknown>;
type Values = Record<string, string | boolean | number[]>;
type Field =
  | { name: string; label: string; type: 'text' | 'int' | 'decimal' | 'email'; nullable?: boolean; hint?: string; unit?: string }
  | { name: string; label: string; type: 'select'; options: { value: string; label: string }[]; nullable?: boolean; hint?: string }
  | { name: string; label: string; type: 'checkbox'; hint?: string }
  | { name: string; label: string; type: 'choices'; options: { value: number; label: string }[]; hint?: string };

export interface LinerRecordsAdminProps {
  kind: Kind;
  initialRows: ReadonlyArray<SpecRow> | ReadonlyArray<SupplierRow>;
  /** For specs: the suppliers and bin types to choose from. */
  suppliers?: { id: number; name: string }[];
  binTypes?: { id: number; name: string }[];
}

const n = (v: number) => v.toLocaleString('en-GB');

function fieldsFor(kind: Kind, suppliers: { id: number; name: string }[], binTypes: { id: number; name: string }[]): Field[] {
  if (kind === 'suppliers') {
    return [
      { name: 'name', label: 'Name', type: 'text' },
      { name: 'orderEmail', label: 'Order e-mail', type: 'email', nullable: true, hint: 'Purchase orders are mailed here.' },
      { name: 'leadTimeDays', label: 'Lead time', type: 'int', unit: 'days' },
      { name: 'orderCost', label: 'Cost per order', type: 'decimal', hint: 'Freight and handling of one order, in the operator’s currency.' },
      { name: 'packSize', label: 'Liners per carton', type: 'int' },
      { name: 'minOrderQty', label: 'Minimum order', type: 'int', unit: 'liners' },
      { name: 'pricePerLiner', label: 'Price per liner', type: 'decimal' },
      { name: 'active', label: 'In use', type: 'checkbox', hint: 'A supplier no longer used keeps its lots and history.' },
    ];
  }
  return [
    { name: 'code', label: 'Code', type: 'text', hint: 'Short and unique, e.g. PV-1250-DN50.' },
    { name: 'name', label: 'Name', type: 'text' },
    { name: 'material', label: 'Material', type: 'text', hint: 'PE, PE/PA, PE/EVOH/PE …' },
    { name: 'layers', label: 'Layers', type: 'int' },
    { name: 'nominalCapacityL', label: 'Nominal capacity', type: 'int', unit: 'L' },
    { name: 'valveType', label: 'Bottom valve', type: 'select', options: VALVE_TYPES.map((v) => ({ value: v, label: VALVE_TYPE_LABEL[v] })) },
    { name: 'valveSize', label: 'Valve size', type: 'text', nullable: true, hint: 'DN50, DN80, or a thread such as S60x6; empty without a valve.' },
    { name: 'glandSize', label: 'Fill gland size', type: 'text', hint: 'DN150, S100x8 …' },
    { name: 'foodContact', label: 'Food-contact grade', type: 'checkbox' },
    { name: 'maxFillTempC', label: 'Highest filling temperature', type: 'int', nullable: true, unit: '°C' },
    { name: 'supplierId', label: 'Supplier', type: 'select', nullable: true, options: suppliers.map((s) => ({ value: String(s.id), label: s.name })) },
    { name: 'articleNumber', label: 'Supplier’s article number', type: 'text', nullable: true },
    {
      name: 'binTypeIds',
      label: 'Fits these bin types',
      type: 'choices',
      options: binTypes.map((b) => ({ value: b.id, label: b.name })),
      hint: 'A fit from a lot of this spec into another bin type is refused. A bin type with no spec listed takes any liner.',
    },
    { name: 'active', label: 'In use', type: 'checkbox' },
  ];
}

function initial(fields: Field[], row: Row | null): Values {
  const v: Values = {};
  for (const f of fields) {
    const value = row?.[f.name];
    if (f.type === 'checkbox') v[f.name] = row ? Boolean(value) : f.name === 'active';
    else if (f.type === 'choices') v[f.name] = Array.isArray(value) ? (value as number[]) : [];
    else if (value !== null && value !== undefined) v[f.name] = String(value);
    else if (f.type === 'select' && !f.nullable) v[f.name] = f.options[0]?.value ?? '';
    else v[f.name] = '';
  }
  return v;
}

/** The form's strings → the body the API parses; a number field that is not a number goes as typed, so the server's message names it. */
function toBody(fields: Field[], values: Values, version: number | undefined) {
  const body: Record<string, unknown> = version === undefined ? {} : { version };
  for (const f of fields) {
    const v = values[f.name];
    if (f.type === 'checkbox' || f.type === 'choices') body[f.name] = v;
    else if ('nullable' in f && f.nullable && String(v).trim() === '') body[f.name] = null;
    else if (f.type === 'int' || f.type === 'decimal' || f.name === 'supplierId') {
      const s = String(v).trim().replace(',', '.');
      body[f.name] = s !== '' && Number.isFinite(Number(s)) ? Number(s) : s;
    } else body[f.name] = String(v);
  }
  return body;
}

function ActiveBadge({ active }: { active: boolean }) {
  return (
    <span className={`inline-flex items-center gap-1.5 whitespace-nowrap font-medium ${active ? 'text-moss' : 'text-ink-soft'}`}>
      <Icon name={active ? 'check' : 'retired'} size={16} /> {active ? 'In use' : 'Not used'}
    </span>
  );
}

export default function LinerRecordsAdmin({ kind, initialRows, suppliers = [], binTypes = [] }: LinerRecordsAdminProps) {
  const [rows, setRows] = useState(initialRows as Row[]);
  const [editing, setEditing] = useState<Row | 'new' | null>(null);
  const [flash, setFlash] = useState<string | null>(null);
  const fields = useMemo(() => fieldsFor(kind, suppliers, binTypes), [kind, suppliers, binTypes]);
  const noun = kind === 'specs' ? 'liner spec' : 'supplier';
  const base = kind === 'specs' ? '/api/admin/liner-specs' : '/api/admin/liner-suppliers';
  const typeName = new Map(binTypes.map((b) => [b.id, b.name]));

  function saved(row: Row, isNew: boolean) {
    setRows((list) => (isNew ? [...list, row] : list.map((r) => (r.id === row.id ? row : r))));
    setEditing(null);
    setFlash(`${isNew ? 'Added' : 'Saved'} ${noun} ${String(row.code ?? row.name)}.`);
  }

  return (
    <div>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <p className="text-ink-soft max-w-prose">
          {kind === 'specs'
            ? 'What each liner is, and the bin types it fits. Lots are received against a spec; the fit checks it.'
            : 'Who supplies liners, and the terms that stock planning uses: lead time, cost per order, cartons, minimum order and price.'}
        </p>
        <button type="button" className="btn-primary" onClick={() => setEditing('new')}>
          <Icon name="plusBox" size={18} /> New {noun}
        </button>
      </div>
      {flash && (
        <p className="notice-good mt-4" role="status">
          {flash}
        </p>
      )}
      <div className="card mt-4 max-w-full overflow-x-auto" role="region" aria-label={kind === 'specs' ? 'Liner specs' : 'Liner suppliers'} tabIndex={0}>
        <table className="w-full text-sm [&_th]:px-2 [&_th]:py-2 [&_th]:text-left [&_th]:font-medium [&_td]:px-2 [&_td]:py-2 [&_td]:align-top [&_tbody_tr]:border-t [&_tbody_tr]:border-paper-line/70 [&_.num]:text-right">
          <thead className="bg-paper-deep/60">
            {kind === 'specs' ? (
              <tr>
                <th>Code</th>
                <th>Spec</th>
                <th className="hidden xl:table-cell">Supplier · article</th>
                <th className="hidden md:table-cell">Fits</th>
                <th className="num">Lots</th>
                <th>Status</th>
                <th>
                  <span className="sr-only">Edit</span>
                </th>
              </tr>
            ) : (
              <tr>
                <th>Supplier</th>
                <th className="hidden lg:table-cell">Order e-mail</th>
                <th className="num hidden sm:table-cell">Lead time</th>
                <th className="num">Per order</th>
                <th className="num">Carton</th>
                <th className="num">Minimum</th>
                <th className="num">Price</th>
                <th>Status</th>
                <th>
                  <span className="sr-only">Edit</span>
                </th>
              </tr>
            )}
          </thead>
          <tbody>
            {rows.map((r) =>
              kind === 'specs' ? (
                <tr key={r.id}>
                  <td className="ident whitespace-nowrap">{String(r.code)}</td>
                  <td>
                    <div className="font-medium">{String(r.name)}</div>
                    <div className="text-sm text-ink-soft">{describeSpec(r as unknown as SpecRow)}</div>
                  </td>
                  <td className="hidden xl:table-cell">
                    {r.supplierName ? `${String(r.supplierName)} · ` : ''}
                    <span className="ident">{String(r.articleNumber ?? '—')}</span>
                  </td>
                  <td className="hidden md:table-cell">
                    {(r.binTypeIds as number[]).length ? (r.binTypeIds as number[]).map((id) => typeName.get(id) ?? `#${id}`).join(', ') : 'no bin type listed'}
                  </td>
                  <td className="num">{n(Number(r.lots))}</td>
                  <td>
                    <ActiveBadge active={r.active} />
                  </td>
                  <td>
                    <button type="button" className="btn-quiet" onClick={() => setEditing(r)} aria-label={`Edit ${String(r.code)}`}>
                      Edit
                    </button>
                  </td>
                </tr>
              ) : (
                <tr key={r.id}>
                  <td className="font-medium">{String(r.name)}</td>
                  <td className="hidden lg:table-cell">{String(r.orderEmail ?? '—')}</td>
                  <td className="num hidden sm:table-cell">{n(Number(r.leadTimeDays))} days</td>
                  <td className="num">{String(r.orderCost)}</td>
                  <td className="num">{n(Number(r.packSize))}</td>
                  <td className="num">{n(Number(r.minOrderQty))}</td>
                  <td className="num">{String(r.pricePerLiner)}</td>
                  <td>
                    <ActiveBadge active={r.active} />
                  </td>
                  <td>
                    <button type="button" className="btn-quiet" onClick={() => setEditing(r)} aria-label={`Edit ${String(r.name)}`}>
                      Edit
                    </button>
                  </td>
                </tr>
              ),
            )}
            {rows.length === 0 && (
              <tr>
                <td colSpan={9} className="text-ink-soft">
                  None yet.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      {editing && (
        <RecordDialog
          title={editing === 'new' ? `New ${noun}` : `Edit ${noun} ${String(editing.code ?? editing.name)}`}
          fields={fields}
          row={editing === 'new' ? null : editing}
          onClose={() => setEditing(null)}
          save={async (body) => {
            const isNew = editing === 'new';
            const out = isNew ? await api.post<{ row: Row }>(base, body) : await api.put<{ row: Row }>(`${base}/${editing.id}`, body);
            saved(out.row, isNew);
          }}
        />
      )}
    </div>
  );
}

function RecordDialog({
  title,
  fields,
  row,
  onClose,
  save,
}: {
  title: string;
  fields: Field[];
  row: Row | null;
  onClose: () => void;
  save: (body: Record<string, unknown>) => Promise<void>;
}) {
  const [values, setValues] = useState<Values>(() => initial(fields, row));
  const [problems, setProblems] = useState<Record<string, string>>({});
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const set = (name: string, v: string | boolean | number[]) => setValues((old) => ({ ...old, [name]: v }));

  async function submit(e: FormEvent) {
    e.preventDefault();
    setBusy(true);
    setProblem(null);
    try {
      await save(toBody(fields, values, row ? Number(row.version) : undefined));
    } catch (err) {
      const byField = err instanceof ApiError ? err.fieldMessages() : {};
      setProblems(byField);
      const detailField = err instanceof ApiError ? (err.details as { field?: string } | undefined)?.field : undefined;
      if (detailField && err instanceof ApiError) setProblems({ [detailField]: err.message });
      setProblem(err instanceof ApiError ? (Object.keys(byField).some((k) => k) ? 'Check the fields marked below.' : err.message) : 'Something went wrong. Try again.');
    } finally {
      setBusy(false);
    }
  }

  return (
    <Dialog title={title} onClose={onClose} labelId="liner-record-title">
      <form onSubmit={submit} className="space-y-3" noValidate>
        {problem && (
          <p className="notice-fault" role="alert">
            {problem}
          </p>
        )}
        {fields.map((f) => {
          const id = `lr-${f.name}`;
          const described = `${id}-problem`;
          if (f.type === 'checkbox') {
            return (
              <div key={f.name}>
                <label className="flex items-center gap-2 min-h-touch">
                  <input id={id} type="checkbox" checked={Boolean(values[f.name])} onChange={(e) => set(f.name, e.target.checked)} /> {f.label}
                </label>
                {f.hint && <p className="text-sm text-ink-soft">{f.hint}</p>}
              </div>
            );
          }
          if (f.type === 'choices') {
            const chosen = values[f.name] as number[];
            return (
              <fieldset key={f.name} aria-describedby={described}>
                <legend className="label">{f.label}</legend>
                {f.options.map((o) => (
                  <label key={o.value} className="flex items-center gap-2 min-h-touch">
                    <input
                      type="checkbox"
                      checked={chosen.includes(o.value)}
                      onChange={(e) => set(f.name, e.target.checked ? [...chosen, o.value] : chosen.filter((x) => x !== o.value))}
                    />{' '}
                    {o.label}
                  </label>
                ))}
                {f.hint && <p className="text-sm text-ink-soft">{f.hint}</p>}
                <FieldProblem id={described} message={problems[f.name]} />
              </fieldset>
            );
          }
          return (
            <div key={f.name}>
              <label className="label" htmlFor={id}>
                {f.label}
                {'unit' in f && f.unit ? ` (${f.unit})` : ''}
                {f.nullable ? ' (optional)' : ''}
              </label>
              {f.type === 'select' ? (
                <select
                  id={id}
                  className="field"
                  value={String(values[f.name])}
                  onChange={(e) => set(f.name, e.target.value)}
                  aria-invalid={Boolean(problems[f.name])}
                  aria-describedby={described}
                >
                  {f.nullable && <option value="">— none —</option>}
                  {f.options.map((o) => (
                    <option key={o.value} value={o.value}>
                      {o.label}
                    </option>
                  ))}
                </select>
              ) : (
                <input
                  id={id}
                  className={`field${f.name === 'code' || f.name.endsWith('Size') || f.name === 'articleNumber' ? ' ident' : ''}`}
                  type={f.type === 'email' ? 'email' : 'text'}
                  inputMode={f.type === 'int' ? 'numeric' : f.type === 'decimal' ? 'decimal' : undefined}
                  value={String(values[f.name])}
                  onChange={(e) => set(f.name, e.target.value)}
                  aria-invalid={Boolean(problems[f.name])}
                  aria-describedby={described}
                />
              )}
              {f.hint && <p className="text-sm text-ink-soft">{f.hint}</p>}
              <FieldProblem id={described} message={problems[f.name]} />
            </div>
          );
        })}
        <div className="flex justify-end gap-2 pt-2">
          <button type="button" className="btn-quiet" onClick={onClose}>
            Cancel
          </button>
          <button type="submit" className="btn-primary" disabled={busy}>
            {busy ? 'Saving…' : 'Save'}
          </button>
        </div>
      </form>
    </Dialog>
  );
}
