// One action's short form (prep checklist, liner lot, hire order, fill record,
// seal check, or a note), with the cautions for that step. Shared by the bin
// page and the yard's offline bin card; the caller decides how the result is
// recorded (directly, or through the phone's scan queue).
import { useState, type FormEvent } from 'react';
import { ACTION_LABELS, type Action, type Status } from '@/lib/scans/lifecycle';
import { Icon } from '@/components/ui/Icon';
import { formatLongDate } from '@/lib/calendar';
import type { LotOption, OrderOption } from '@/lib/yard/action-options.server';

/** What the forms offer: lots in first-expiry-first-out order, orders soonest first. */
export interface ActionOptions {
  lots: LotOption[];
  orders: OrderOption[];
  cautions: Partial<Record<Action, string[]>>;
  defer: string;
  status: Status;
}

const CHECKS: Array<[key: string, label: string]> = [
  ['panelsAndLocks', 'Panels and locks'],
  ['floorAndWalls', 'Floor and inner walls free of damage or sharp edges'],
  ['dischargePort', 'Discharge port and valve seat'],
  ['lidAndSealHoles', 'Lid and seal holes'],
  ['labelLegible', 'Label legible'],
];

const DESTRUCTIVE: Action[] = ['retire', 'mark_missing', 'quarantine'];

export function Cautions({ lines, defer }: { lines: string[]; defer: string }) {
  if (!lines.length) return null;
  return (
    <div className="notice-attention" role="note">
      <div className="flex items-center gap-2 font-medium">
        <Icon name="alert" /> Take care
      </div>
      <ul className="mt-1 list-disc pl-5">
        {lines.map((l) => (
          <li key={l}>{l}</li>
        ))}
      </ul>
      <p className="mt-1 text-xs">{defer}</p>
    </div>
  );
}

/** Uploads fault photos; without signal the scan goes ahead and says the photos are missing. */
export async function uploadPhotos(files: File[], note: (msg: string | null) => void): Promise<number[]> {
  const ids: number[] = [];
  for (const file of files) {
    const form = new FormData();
    form.append('file', file);
    form.append('purpose', 'photo');
    try {
      const res = await fetch('/api/attachments', { method: 'POST', body: form, credentials: 'same-origin' });
      const json = (await res.json()) as { data?: { id: number }; error?: { message: string } };
      if (!res.ok || !json.data) {
        note(json.error?.message ?? 'A photo could not be stored.');
        continue;
      }
      ids.push(json.data.id);
    } catch {
      note('No signal: the fault is recorded without its photos.');
      break;
    }
  }
  return ids;
}

export default function ActionForm({
  action,
  options,
  busy,
  onCancel,
  onSubmit,
}: {
  action: Action;
  options: ActionOptions;
  busy: boolean;
  onCancel: () => void;
  onSubmit: (extra: Record<string, unknown>) => void;
}) {
  const [checks, setChecks] = useState<Record<string, boolean>>(Object.fromEntries(CHECKS.map(([k]) => [k, true])));
  const [faults, setFaults] = useState('');
  const [photos, setPhotos] = useState<File[]>([]);
  const [photoNote, setPhotoNote] = useState<string | null>(null);
  const [lotId, setLotId] = useState<number | null>(options.lots[0]?.id ?? null);
  const [lotText, setLotText] = useState('');
  const [orderId, setOrderId] = useState<number | null>(options.orders[0]?.id ?? null);
  const [purpose, setPurpose] = useState<'hire' | 'transfer'>(options.status === 'available' ? 'transfer' : 'hire');
  const [note, setNote] = useState('');
  const [confirmed, setConfirmed] = useState(!DESTRUCTIVE.includes(action));
  const [fill, setFill] = useState({ product: '', volumeL: '', massKg: '', temperatureC: '', seals: '' });
  const [sealsVerified, setSealsVerified] = useState('');
  const failed = CHECKS.filter(([k]) => !checks[k]);
  const num = (s: string) => (s.trim() === '' ? null : Number(s));
  const seals = (s: string) =>
    s
      .split(/[\s,;]+/)
      .map((x) => x.trim())
      .filter(Boolean);

  async function handle(e: FormEvent) {
    e.preventDefault();
    switch (action) {
      case 'prep_check': {
        const photoIds = failed.length ? await uploadPhotos(photos, setPhotoNote) : [];
        const lost = failed.length > 0 && photos.length > photoIds.length;
        const text = lost ? `${faults} (photos not uploaded: no signal)` : faults;
        return onSubmit({ prepResult: failed.length ? 'fail' : 'pass', checklist: checks, faults: text || undefined, ...(photoIds.length ? { photoIds } : {}) });
      }
      case 'fit_liner':
        return onSubmit({ linerLotId: lotId ?? undefined });
      case 'dispatch':
        return onSubmit(purpose === 'hire' ? { purpose, hireOrderId: orderId ?? undefined } : { purpose });
      case 'fill_seal':
        return onSubmit({ fill: { product: fill.product, volumeL: num(fill.volumeL), massKg: num(fill.massKg), temperatureC: num(fill.temperatureC), seals: seals(fill.seals) } });
      case 'discharge':
        return onSubmit({ sealsVerified: seals(sealsVerified) });
      default:
        return onSubmit(note ? { note } : {});
    }
  }

  return (
    <form onSubmit={(e) => void handle(e)} className="card space-y-4 p-4" data-form={action}>
      <h3 className="font-semibold">{ACTION_LABELS[action]}</h3>
      <Cautions lines={options.cautions[action] ?? []} defer={options.defer} />

      {action === 'prep_check' && (
        <fieldset className="space-y-2">
          <legend className="label">Check each point; mark a fault where you find one</legend>
          {CHECKS.map(([k, label]) => (
            <div key={k} className="flex items-center justify-between gap-3 rounded-md border border-paper-line px-3 py-2">
              <span>{label}</span>
              <div className="flex gap-1" role="group" aria-label={label}>
                <button
                  type="button"
                  className={checks[k] ? 'btn-primary min-h-[44px] px-3' : 'btn-quiet min-h-[44px] px-3'}
                  aria-pressed={checks[k]}
                  onClick={() => setChecks({ ...checks, [k]: true })}
                >
                  OK
                </button>
                <button
                  type="button"
                  data-fault={k}
                  className={!checks[k] ? 'btn-danger min-h-[44px] px-3' : 'btn-quiet min-h-[44px] px-3'}
                  aria-pressed={!checks[k]}
                  onClick={() => setChecks({ ...checks, [k]: false })}
                >
                  Fault
                </button>
              </div>
            </div>
          ))}
          {failed.length > 0 && (
            <>
              <label className="label" htmlFor="faults">
                What is wrong (the bin goes to quarantine)
              </label>
              <textarea id="faults" className="field min-h-[80px] py-2" required minLength={3} maxLength={500} value={faults} onChange={(e) => setFaults(e.target.value)} />
              <label className="label" htmlFor="fault-photos">
                Photos of the fault (up to 4)
              </label>
              <input
                id="fault-photos"
                type="file"
                accept="image/*"
                capture="environment"
                multiple
                className="block w-full text-sm"
                onChange={(e) => setPhotos(Array.from(e.target.files ?? []).slice(0, 4))}
              />
              {photoNote && <p className="notice-attention">{photoNote}</p>}
            </>
          )}
        </fieldset>
      )}

      {action === 'fit_liner' && (
        <fieldset className="space-y-2">
          <legend className="label">Liner lot (use the first: it expires soonest)</legend>
          {options.lots.length === 0 && <p className="notice-fault">No usable liner lot at this depot. Receive a lot or ask the planner.</p>}
          {options.lots.length > 0 && (
            <div>
              <label className="label" htmlFor="lot-number">
                Or type / scan the lot number on the liner box
              </label>
              <input
                id="lot-number"
                className="field ident"
                autoComplete="off"
                autoCapitalize="characters"
                spellCheck={false}
                value={lotText}
                onChange={(e) => {
                  const typed = e.target.value;
                  setLotText(typed);
                  const match = options.lots.find((l) => l.lotNumber.toUpperCase() === typed.trim().toUpperCase());
                  if (match) setLotId(match.id);
                }}
              />
              {lotText.trim() !== '' && !options.lots.some((l) => l.lotNumber.toUpperCase() === lotText.trim().toUpperCase()) && (
                <p className="notice-attention mt-1" role="status">
                  Lot {lotText.trim()} is not a usable lot at this depot: it may be expired, on hold or recalled, used up, or not received here. Take a liner from a lot listed
                  below.
                </p>
              )}
            </div>
          )}
          {options.lots.map((l, i) => (
            <label key={l.id} className="flex items-center gap-3 rounded-md border border-paper-line px-3 min-h-touch">
              <input type="radio" name="lot" checked={lotId === l.id} onChange={() => setLotId(l.id)} />
              <span className="ident whitespace-nowrap">{l.lotNumber}</span>
              <span className="text-sm text-ink-soft">
                {l.supplier} · expires {formatLongDate(l.expiryDate)} · {l.onHand} on the shelf
              </span>
              {i === 0 && <span className="ml-auto text-xs font-medium text-kelp">Use first</span>}
            </label>
          ))}
        </fieldset>
      )}

      {action === 'dispatch' && (
        <fieldset className="space-y-2">
          <legend className="label">Goes out on</legend>
          {options.status === 'prepared' &&
            options.orders.map((o) => (
              <label key={o.id} className="flex items-center gap-3 rounded-md border border-paper-line px-3 min-h-touch">
                <input
                  type="radio"
                  name="order"
                  checked={purpose === 'hire' && orderId === o.id}
                  onChange={() => {
                    setPurpose('hire');
                    setOrderId(o.id);
                  }}
                />
                <span className="ident">{o.reference}</span>
                <span className="text-sm">{o.customer}</span>
                <span className="ml-auto text-sm text-ink-soft num">
                  {o.loaded}/{o.quantity} · by {formatLongDate(o.neededBy)}
                </span>
              </label>
            ))}
          {options.status === 'prepared' && options.orders.length === 0 && <p className="notice-attention">No confirmed hire order at this depot for this bin type.</p>}
          {options.status === 'available' && <p>Transfer of folded empties to another depot (no hire).</p>}
        </fieldset>
      )}

      {action === 'fill_seal' && (
        <div className="grid gap-3 sm:grid-cols-2">
          <div className="sm:col-span-2">
            <label className="label" htmlFor="product">
              Product
            </label>
            <input id="product" className="field" required maxLength={120} value={fill.product} onChange={(e) => setFill({ ...fill, product: e.target.value })} />
          </div>
          <div>
            <label className="label" htmlFor="volume">
              Volume (L)
            </label>
            <input id="volume" className="field num" inputMode="decimal" value={fill.volumeL} onChange={(e) => setFill({ ...fill, volumeL: e.target.value })} />
          </div>
          <div>
            <label className="label" htmlFor="mass">
              Mass (kg)
            </label>
            <input id="mass" className="field num" inputMode="decimal" value={fill.massKg} onChange={(e) => setFill({ ...fill, massKg: e.target.value })} />
          </div>
          <div>
            <label className="label" htmlFor="temp">
              Temperature (°C)
            </label>
            <input id="temp" className="field num" inputMode="decimal" value={fill.temperatureC} onChange={(e) => setFill({ ...fill, temperatureC: e.target.value })} />
          </div>
          <div>
            <label className="label" htmlFor="seals">
              Seal numbers
            </label>
            <input id="seals" className="field ident" placeholder="TE1234567, TE1234568" value={fill.seals} onChange={(e) => setFill({ ...fill, seals: e.target.value })} />
          </div>
        </div>
      )}

      {action === 'discharge' && (
        <div>
          <label className="label" htmlFor="sealsVerified">
            Seal numbers found on the bin
          </label>
          <input id="sealsVerified" className="field ident" value={sealsVerified} onChange={(e) => setSealsVerified(e.target.value)} placeholder="as printed on each seal" />
        </div>
      )}

      {!['prep_check', 'fit_liner', 'dispatch', 'fill_seal', 'discharge'].includes(action) && (
        <div>
          <label className="label" htmlFor="note">
            Note (optional)
          </label>
          <input id="note" className="field" maxLength={500} value={note} onChange={(e) => setNote(e.target.value)} />
        </div>
      )}

      {DESTRUCTIVE.includes(action) && (
        <label className="flex items-center gap-3">
          <input type="checkbox" checked={confirmed} onChange={(e) => setConfirmed(e.target.checked)} className="h-6 w-6" />
          <span>Yes, {ACTION_LABELS[action].toLowerCase()} this bin</span>
        </label>
      )}

      <div className="flex gap-2">
        <button className="btn-primary" type="submit" disabled={busy || !confirmed || (action === 'fit_liner' && !lotId)}>
          {busy ? 'Recording…' : action === 'prep_check' && failed.length ? 'Record fault and quarantine' : `Record ${ACTION_LABELS[action].toLowerCase()}`}
        </button>
        <button className="btn-quiet" type="button" onClick={onCancel}>
          Cancel
        </button>
      </div>
    </form>
  );
}
