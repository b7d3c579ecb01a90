// Receiving a carton lot of liners on the phone: scan the carton's code (the yard's QR reader) or type the lot
// number — a GS1 code fills lot, dates and count — then supplier, spec, the purchase order if there is one, and
// the certificate (a photo or the PDF). Sent as one multipart form to POST /api/liners/receipts.
import { useState, type FormEvent } from 'react';
import QrCapture from './QrCapture';
import { looksLikeCartonCode, readCartonLabel } from '@/lib/liners/carton-label';
import type { ReceivingOptions } from '@/lib/liners/liner-receiving.server';

interface Done {
  lotNumber: string;
  purchaseOrder: string | null;
  purchaseOrderClosed: boolean;
  quantity: number;
}

export default function ReceiveLiners({ options }: { options: ReceivingOptions }) {
  const [lot, setLot] = useState('');
  const [quantity, setQuantity] = useState('');
  const [made, setMade] = useState('');
  const [expiry, setExpiry] = useState('');
  const [supplierId, setSupplierId] = useState(options.suppliers.length === 1 ? String(options.suppliers[0]!.id) : '');
  const [specId, setSpecId] = useState('');
  const [poId, setPoId] = useState('');
  const [read, setRead] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [done, setDone] = useState<Done | null>(null);

  const specs = options.specs.filter((s) => !supplierId || s.supplierId === null || String(s.supplierId) === supplierId);
  const orders = options.orders.filter((o) => (!supplierId || String(o.supplierId) === supplierId) && (!specId || String(o.specId) === specId));
  const spec = options.specs.find((s) => String(s.id) === specId);

  function fromCode(text: string) {
    const label = readCartonLabel(text);
    if (!label) {
      setRead('That code is not a carton label or a lot number. Type the lot number as printed.');
      return;
    }
    if (label.lotNumber) setLot(label.lotNumber);
    if (label.expiryDate) setExpiry(label.expiryDate);
    if (label.manufacturedOn) setMade(label.manufacturedOn);
    if (label.quantity) setQuantity(String(label.quantity));
    const found = [
      label.lotNumber && `lot ${label.lotNumber}`,
      label.expiryDate && `expiry ${label.expiryDate}`,
      label.manufacturedOn && `made ${label.manufacturedOn}`,
      label.quantity && `${label.quantity} liners`,
    ]
      .filter(Boolean)
      .join(', ');
    setRead(label.read === 'plain' ? `Lot number ${label.lotNumber}.` : `Read from the carton: ${found || 'no lot or dates'}. Check them against the label.`);
  }

  function choosePo(id: string) {
    setPoId(id);
    const o = options.orders.find((x) => String(x.id) === id);
    if (o) {
      setSupplierId(String(o.supplierId));
      setSpecId(String(o.specId));
      if (!quantity) setQuantity(String(o.remaining));
    }
  }

  async function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setBusy(true);
    setError(null);
    const form = new FormData(e.currentTarget);
    try {
      const res = await fetch('/api/liners/receipts', { method: 'POST', body: form, credentials: 'same-origin' });
      const json = (await res.json()) as { data?: { lot: Omit<Done, 'quantity'> }; error?: { message: string } };
      if (!res.ok || !json.data) throw new Error(json.error?.message ?? `The lot could not be recorded (HTTP ${res.status}).`);
      setDone({ ...json.data.lot, quantity: Number(quantity) });
    } catch (err) {
      setError(err instanceof TypeError ? 'No signal: the lot was not recorded. Try again when the phone is online.' : (err as Error).message);
    } finally {
      setBusy(false);
    }
  }

  if (done) {
    return (
      <div className="notice-good" role="status" data-testid="received">
        <p>
          Lot <span className="ident">{done.lotNumber}</span> received: {done.quantity.toLocaleString('en-GB')} liners are on the shelf here.
          {done.purchaseOrder && (done.purchaseOrderClosed ? ` Purchase order ${done.purchaseOrder} is complete.` : ` Counted against ${done.purchaseOrder}.`)}
        </p>
        <a className="btn-quiet mt-3" href="/yard/liners/receive">
          Receive another lot
        </a>
      </div>
    );
  }

  return (
    <form className="space-y-4" onSubmit={submit} data-testid="receive-form" encType="multipart/form-data">
      <fieldset className="space-y-2">
        <legend className="font-medium">The carton</legend>
        <QrCapture onDecoded={fromCode} disabled={busy} />
        <div>
          <label className="label" htmlFor="rcv-lot">
            Lot number (or the carton’s code)
          </label>
          <input
            id="rcv-lot"
            name="lotNumber"
            className="field ident"
            value={lot}
            required
            maxLength={200}
            autoComplete="off"
            onChange={(e) => setLot(e.target.value)}
            onBlur={(e) => {
              if (looksLikeCartonCode(e.target.value)) fromCode(e.target.value);
            }}
          />
        </div>
        {read && (
          <p className="text-sm" role="status" data-testid="carton-read">
            {read}
          </p>
        )}
      </fieldset>
      {options.orders.length > 0 && (
        <div>
          <label className="label" htmlFor="rcv-po">
            Purchase order
          </label>
          <select id="rcv-po" name="purchaseOrderId" className="field" value={poId} onChange={(e) => choosePo(e.target.value)}>
            <option value="">None (not ordered, or not known)</option>
            {(poId ? options.orders : orders).map((o) => (
              <option key={o.id} value={o.id}>
                {o.reference} · {o.remaining.toLocaleString('en-GB')} to come
              </option>
            ))}
          </select>
        </div>
      )}
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <div>
          <label className="label" htmlFor="rcv-supplier">
            Supplier
          </label>
          <select id="rcv-supplier" name="supplierId" className="field" required value={supplierId} onChange={(e) => setSupplierId(e.target.value)}>
            <option value="">Choose…</option>
            {options.suppliers.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label className="label" htmlFor="rcv-spec">
            Liner spec
          </label>
          <select id="rcv-spec" name="linerSpecId" className="field" required value={specId} onChange={(e) => setSpecId(e.target.value)}>
            <option value="">Choose…</option>
            {specs.map((s) => (
              <option key={s.id} value={s.id}>
                {s.code} · {s.name}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label className="label" htmlFor="rcv-qty">
            Liners
          </label>
          <input
            id="rcv-qty"
            name="quantity"
            type="number"
            inputMode="numeric"
            min={1}
            max={100000}
            className="field num"
            required
            value={quantity}
            onChange={(e) => setQuantity(e.target.value)}
          />
        </div>
        <div>
          <label className="label" htmlFor="rcv-made">
            Manufactured
          </label>
          <input id="rcv-made" name="manufacturedOn" type="date" className="field" value={made} onChange={(e) => setMade(e.target.value)} />
        </div>
        <div>
          <label className="label" htmlFor="rcv-expiry">
            Expires
          </label>
          <input id="rcv-expiry" name="expiryDate" type="date" className="field" required value={expiry} onChange={(e) => setExpiry(e.target.value)} />
        </div>
      </div>
      <div>
        <label className="label" htmlFor="rcv-cert">
          Certificate {spec?.foodContact ? '(needed: food-contact liners)' : '(if one came with the lot)'}
        </label>
        <input id="rcv-cert" name="certificate" type="file" accept="application/pdf,image/jpeg,image/png" className="block w-full text-sm" required={!!spec?.foodContact} />
        <p className="mt-1 text-xs text-ink-soft">The declaration of compliance: a PDF, or a photo of the paper (JPEG or PNG), up to 10 MB.</p>
      </div>
      {error && (
        <p className="notice-fault" role="alert" data-testid="receive-error">
          {error}
        </p>
      )}
      <p className="text-xs text-ink-soft">Cartons are heavy: lift with your legs or use a trolley, and follow your site’s handling procedures.</p>
      <button className="btn-primary w-full" type="submit" disabled={busy}>
        {busy ? 'Recording…' : `Receive the lot at ${options.depot?.name ?? 'this depot'}`}
      </button>
    </form>
  );
}
