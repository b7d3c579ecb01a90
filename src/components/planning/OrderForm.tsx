import { useMemo, useState, type FormEvent } from 'react';
import { api, ApiError } from '@/lib/api.client';
import type { OrderFormChoices } from '@/lib/planning/orders.server';
import { FormField, describedBy } from '@/components/bins/FormField';
import { Icon } from '@/components/ui/Icon';

interface Fields {
  customerId: string;
  deliverySiteId: string;
  depotSiteId: string;
  binTypeId: string;
  quantity: string;
  neededBy: string;
  product: string;
  notes: string;
  linerFoodContact: boolean;
  linerMaxFillTempC: string;
}

const NAMES: Record<string, string> = {
  customerId: 'Customer',
  deliverySiteId: 'Filling site',
  depotSiteId: 'Depot',
  binTypeId: 'Bin type',
  quantity: 'Quantity',
  neededBy: 'Wanted on',
  product: 'Product',
  notes: 'Notes',
  linerMaxFillTempC: 'Highest filling temperature',
};

/** The planner enters a hire order: saved as a draft (counts nowhere) or confirmed at once. */
export function OrderForm({ choices, today }: { choices: OrderFormChoices; today: string }) {
  const [f, setF] = useState<Fields>({
    customerId: '',
    deliverySiteId: '',
    depotSiteId: choices.depots.length === 1 ? String(choices.depots[0]!.id) : '',
    binTypeId: choices.binTypes.length === 1 ? String(choices.binTypes[0]!.id) : '',
    quantity: '',
    neededBy: '',
    product: '',
    notes: '',
    linerFoodContact: false,
    linerMaxFillTempC: '',
  });
  const [problems, setProblems] = useState<Record<string, string>>({});
  const [formProblem, setFormProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const sites = useMemo(() => choices.customers.find((c) => String(c.id) === f.customerId)?.sites ?? [], [choices, f.customerId]);
  const set = (patch: Partial<Fields>) => setF((old) => ({ ...old, ...patch }));

  function local(): Record<string, string> {
    const p: Record<string, string> = {};
    for (const key of ['customerId', 'deliverySiteId', 'depotSiteId', 'binTypeId', 'quantity', 'neededBy'] as const) if (!f[key]) p[key] = 'Required.';
    if (f.quantity && !/^\d+$/.test(f.quantity)) p.quantity = 'A whole number of bins.';
    if (f.linerMaxFillTempC && !/^-?\d+$/.test(f.linerMaxFillTempC)) p.linerMaxFillTempC = 'Whole degrees Celsius, or leave empty.';
    return p;
  }

  async function submit(e: FormEvent<HTMLFormElement>, confirm: boolean) {
    e.preventDefault();
    setFormProblem(null);
    const p = local();
    setProblems(p);
    if (Object.keys(p).length) return;
    setBusy(true);
    try {
      const created = await api.post<{ id: number; reference: string }>('/api/planning/orders', {
        customerId: Number(f.customerId),
        deliverySiteId: Number(f.deliverySiteId),
        depotSiteId: Number(f.depotSiteId),
        binTypeId: Number(f.binTypeId),
        quantity: Number(f.quantity),
        neededBy: f.neededBy,
        product: f.product || null,
        notes: f.notes || null,
        linerFoodContact: f.linerFoodContact,
        linerMaxFillTempC: f.linerMaxFillTempC === '' ? null : Number(f.linerMaxFillTempC),
        confirm,
      });
      window.location.assign(`/planning/orders/${created.id}?created=1`);
    } catch (err) {
      setBusy(false);
      if (err instanceof ApiError) {
        const fields = err.fieldMessages();
        setProblems(fields);
        const named = Object.keys(fields)
          .filter((k) => k && NAMES[k])
          .map((k) => NAMES[k]);
        setFormProblem(named.length ? `${err.message} Check: ${named.join(', ')}.` : err.message);
      } else setFormProblem('The order could not be saved. Check the connection and try again.');
    }
  }

  const field = (id: keyof Fields) => ({ id: `o-${id}`, ...describedBy(`o-${id}`, problems[id]) });
  return (
    <form className="card mt-4 grid gap-4 p-4 md:grid-cols-2" noValidate onSubmit={(e) => submit(e, true)} data-testid="order-form">
      <FormField id="o-customerId" label="Customer" problem={problems.customerId}>
        <select className="field" {...field('customerId')} value={f.customerId} onChange={(e) => set({ customerId: e.target.value, deliverySiteId: '' })}>
          <option value="">Choose a customer</option>
          {choices.customers.map((c) => (
            <option key={c.id} value={c.id}>
              {c.name}
            </option>
          ))}
        </select>
      </FormField>
      <FormField
        id="o-deliverySiteId"
        label="Filling site"
        hint={f.customerId && sites.length === 0 ? 'This customer has no active site.' : undefined}
        problem={problems.deliverySiteId}
      >
        <select className="field" {...field('deliverySiteId')} value={f.deliverySiteId} disabled={!f.customerId} onChange={(e) => set({ deliverySiteId: e.target.value })}>
          <option value="">{f.customerId ? 'Choose the site' : 'Choose the customer first'}</option>
          {sites.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </select>
      </FormField>
      <FormField id="o-binTypeId" label="Bin type" problem={problems.binTypeId}>
        <select className="field" {...field('binTypeId')} value={f.binTypeId} onChange={(e) => set({ binTypeId: e.target.value })}>
          <option value="">Choose a bin type</option>
          {choices.binTypes.map((b) => (
            <option key={b.id} value={b.id}>
              {b.name} ({b.nominalCapacityL} L)
            </option>
          ))}
        </select>
      </FormField>
      <FormField id="o-quantity" label="Quantity (bins)" problem={problems.quantity}>
        <input className="field num" inputMode="numeric" {...field('quantity')} value={f.quantity} onChange={(e) => set({ quantity: e.target.value.trim() })} />
      </FormField>
      <FormField id="o-depotSiteId" label="Served from depot" problem={problems.depotSiteId}>
        <select className="field" {...field('depotSiteId')} value={f.depotSiteId} onChange={(e) => set({ depotSiteId: e.target.value })}>
          <option value="">Choose a depot</option>
          {choices.depots.map((d) => (
            <option key={d.id} value={d.id}>
              {d.name}
            </option>
          ))}
        </select>
      </FormField>
      <FormField id="o-neededBy" label="Wanted on" hint="The terms are those of the customer's tariff in force on this day." problem={problems.neededBy}>
        <input className="field" type="date" min={today} {...field('neededBy')} value={f.neededBy} onChange={(e) => set({ neededBy: e.target.value })} />
      </FormField>
      <fieldset className="md:col-span-2 grid gap-3 md:grid-cols-2 border-t border-paper-line pt-3">
        <legend className="font-medium">Liner needed</legend>
        <label className="flex items-center gap-2 min-h-touch">
          <input type="checkbox" className="h-5 w-5 accent-kelp" checked={f.linerFoodContact} onChange={(e) => set({ linerFoodContact: e.target.checked })} data-testid="o-food" />
          Food-contact grade
        </label>
        <FormField id="o-linerMaxFillTempC" label="Highest filling temperature (°C)" hint="Leave empty when the product is filled cold." problem={problems.linerMaxFillTempC}>
          <input
            className="field num"
            inputMode="numeric"
            {...field('linerMaxFillTempC')}
            value={f.linerMaxFillTempC}
            onChange={(e) => set({ linerMaxFillTempC: e.target.value.trim() })}
          />
        </FormField>
      </fieldset>
      <FormField id="o-product" label="Product (optional)" problem={problems.product}>
        <input className="field" maxLength={120} {...field('product')} value={f.product} onChange={(e) => set({ product: e.target.value })} />
      </FormField>
      <FormField id="o-notes" label="Notes (optional)" problem={problems.notes}>
        <textarea className="field" rows={2} maxLength={2000} {...field('notes')} value={f.notes} onChange={(e) => set({ notes: e.target.value })} />
      </FormField>
      {formProblem && (
        <p className="md:col-span-2 notice-fault flex items-start gap-2" role="alert">
          <Icon name="alert" size={18} className="mt-0.5 shrink-0" /> {formProblem}
        </p>
      )}
      <div className="md:col-span-2 flex flex-wrap gap-3">
        <button type="submit" className="btn-primary" disabled={busy}>
          Confirm order
        </button>
        <button type="button" className="btn-quiet" disabled={busy} onClick={(e) => submit(e as unknown as FormEvent<HTMLFormElement>, false)}>
          Save as draft
        </button>
        <p className="text-sm text-ink-soft self-center">A draft counts nowhere: depots see an order once it is confirmed.</p>
      </div>
    </form>
  );
}
