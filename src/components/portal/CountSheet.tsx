// The monthly count of one site: the pool's list of the bins there, to tick — or scan each label with the phone's
// camera (the yard's scanner), which ticks the bin, or adds one that is not on the list. It is a plain form post:
// without script the boxes still tick and send; the scanner appears once the page's script runs.
import { useEffect, useState } from 'react';
import ScanInput, { type Identified } from '@/components/yard/ScanInput';
import { Icon } from '@/components/ui/Icon';

interface Bin {
  grai: string;
  serial: string;
  status: string;
}
interface Props {
  siteName: string;
  bins: Bin[];
  prefixLength: number;
  /** What a refused post had ticked and scanned, to show again. */
  counted?: string[];
}
type Note = { ok: boolean; text: string };

export default function CountSheet({ siteName, bins, prefixLength, counted = [] }: Props) {
  const listed = new Set(bins.map((b) => b.grai));
  const [ticked, setTicked] = useState<Set<string>>(() => new Set(counted.filter((g) => listed.has(g))));
  const [extra, setExtra] = useState<string[]>(() => counted.filter((g) => !listed.has(g)));
  const [scanned, setScanned] = useState(false);
  const [note, setNote] = useState<Note | null>(null);
  const [live, setLive] = useState(false);
  useEffect(() => setLive(true), []);

  const tick = (grai: string, on: boolean) =>
    setTicked((s) => {
      const next = new Set(s);
      if (on) next.add(grai);
      else next.delete(grai);
      return next;
    });

  function identified(id: Identified) {
    setScanned(true);
    const bin = bins.find((b) => (id.grai ? b.grai === id.grai : b.serial === id.serial));
    if (bin) {
      tick(bin.grai, true);
      setNote({ ok: true, text: `Ticked ${bin.serial}.` });
    } else if (id.grai) {
      if (!extra.includes(id.grai)) setExtra((x) => [...x, id.grai!]);
      setNote({ ok: false, text: `${id.grai} is not on the list for ${siteName}: it is added as a bin found here.` });
    } else {
      setNote({ ok: false, text: `No bin with serial ${id.serial} is on the list for ${siteName}. For a bin not on the list, type its full GRAI or scan its label.` });
    }
  }

  const missing = bins.length - ticked.size;
  return (
    <div className="space-y-4">
      {live && (
        <section className="card p-4" aria-labelledby="count-scan-title" data-count-scanner>
          <h2 id="count-scan-title" className="flex items-center gap-2">
            <Icon name="scan" /> Scan the labels
          </h2>
          <p className="mt-1 text-sm text-ink-soft">Each label you scan ticks its bin below. Mind forklift traffic while you walk the stacks.</p>
          <div className="mt-3">
            <ScanInput prefixLength={prefixLength} onIdentified={identified} keepCameraOpen label="Or type a GRAI or serial" />
          </div>
          {note && (
            <p className={`mt-3 ${note.ok ? 'notice-good' : 'notice-attention'}`} role="status" data-count-note>
              {note.text}
            </p>
          )}
        </section>
      )}
      <form method="post" encType="multipart/form-data" className="card p-4" data-portal-form="count">
        <input type="hidden" name="method" value={scanned ? 'scanned' : 'ticked'} />
        <fieldset>
          <legend className="font-semibold">
            Bins we have at {siteName} ({bins.length})
          </legend>
          <p className="text-sm text-ink-soft">Tick each bin you can see at the site. Leave a box empty when the bin is not there.</p>
          {bins.length === 0 ? (
            <p className="mt-3 text-ink-soft">Our list has no bins at this site. If you find any of ours there, scan them.</p>
          ) : (
            <ul className="mt-3 divide-y divide-paper-line border-y border-paper-line" aria-label={`Bins at ${siteName}`}>
              {bins.map((b) => (
                <li key={b.grai} className="py-1">
                  <label className="flex min-h-[44px] items-center gap-3 px-1" data-count-bin={b.serial}>
                    <input type="checkbox" name="counted" value={b.grai} className="h-5 w-5" checked={ticked.has(b.grai)} onChange={(e) => tick(b.grai, e.target.checked)} />
                    <span className="ident font-medium">{b.serial}</span>
                    <span className="text-xs text-ink-soft">{b.status === 'awaiting_collection' ? 'folded, waiting for collection' : 'on hire'}</span>
                  </label>
                </li>
              ))}
            </ul>
          )}
        </fieldset>
        {extra.length > 0 && (
          <section className="mt-4" aria-labelledby="count-extra-title">
            <h3 id="count-extra-title" className="font-semibold">
              Found here, not on our list ({extra.length})
            </h3>
            <ul className="mt-2 space-y-1" data-count-extra>
              {extra.map((g) => (
                <li key={g} className="flex items-center justify-between gap-2">
                  <input type="hidden" name="counted" value={g} />
                  <span className="ident break-all">{g}</span>
                  <button type="button" className="btn-quiet" onClick={() => setExtra((x) => x.filter((y) => y !== g))}>
                    Remove <span className="sr-only">{g}</span>
                  </button>
                </li>
              ))}
            </ul>
          </section>
        )}
        <p className="mt-4 text-sm" data-count-summary aria-live="polite">
          {live ? (
            <>
              <strong className="num">{ticked.size}</strong> of <span className="num">{bins.length}</span> ticked
              {missing > 0 && <>, {missing} not seen</>}
              {extra.length > 0 && <>, {extra.length} not on the list</>}. A difference goes to our planner, who settles it bin by bin.
            </>
          ) : (
            'A difference goes to our planner, who settles it bin by bin.'
          )}
        </p>
        <button type="submit" className="btn-primary mt-3 w-full sm:w-auto">
          <Icon name="check" /> Confirm the count
        </button>
      </form>
    </div>
  );
}
