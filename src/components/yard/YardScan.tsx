// The yard page's scan box. With signal, an identified bin opens its page;
// without, the bin is shown right here from the phone's depot snapshot and
// what is recorded waits in the phone's queue.
import { useEffect, useRef, useState } from 'react';
import ScanInput, { binHref, type Identified } from './ScanInput';
import OfflineBinCard from './OfflineBinCard';
import { serverReachable } from '@/lib/yard/scan-queue.client';

export default function YardScan({ prefixLength }: { prefixLength: number }) {
  const [card, setCard] = useState<{ id: Identified; n: number } | null>(null);
  const [checking, setChecking] = useState(false);
  const count = useRef(0);

  // Offline, a bin page the phone never saved falls back to this page (the service worker serves it at
  // the bin's address): show that bin from the snapshot straight away.
  useEffect(() => {
    const m = /^\/bins\/(0\d{13}[^/]+)$/.exec(window.location.pathname);
    if (m) setCard({ id: { grai: decodeURIComponent(m[1]!), serial: null }, n: ++count.current });
  }, []);

  async function onIdentified(id: Identified) {
    setChecking(true);
    try {
      if (await serverReachable()) {
        window.location.assign(binHref(id));
        return;
      }
      count.current += 1;
      setCard({ id, n: count.current });
      requestAnimationFrame(() => document.querySelector('[data-offline-card]')?.scrollIntoView({ block: 'start', behavior: 'smooth' }));
    } finally {
      setChecking(false);
    }
  }

  return (
    <>
      <ScanInput prefixLength={prefixLength} onIdentified={onIdentified} busy={checking} />
      {card && <OfflineBinCard key={card.n} identified={card.id} prefixLength={prefixLength} onClose={() => setCard(null)} />}
    </>
  );
}
