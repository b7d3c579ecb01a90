// Identify a bin three ways: scan its QR label with the live camera, take a
// photo of the label, or type the GRAI (checked as you type, so a misread
// digit is caught at once) or the serial printed under the code. The QR
// carries a GS1 Digital Link URI (…/8003/<GRAI>); whichever way the identity
// came in, the same thing happens next.
import { useState, type FormEvent } from 'react';
import { identify, identifyDecoded, isIdentified, type Identified, type IdentifyResult } from '@/lib/bins/bin-identify';
import { Icon } from '@/components/ui/Icon';
import QrCapture from './QrCapture';

export type { Identified };
export { identify };

interface Props {
  prefixLength: number;
  /** Without a handler the page opens the bin. */
  onIdentified?: (id: Identified) => void | Promise<void>;
  label?: string;
  busy?: boolean;
  /** Continuous scanning (a load): the camera stays open and reports each new code. */
  keepCameraOpen?: boolean;
}

export function binHref(id: Identified): string {
  return id.grai ? `/bins/${id.grai}` : `/bins/find?q=${encodeURIComponent(id.serial!)}`;
}

export default function ScanInput({ prefixLength, onIdentified, label = 'Type the GRAI or serial', busy = false, keepCameraOpen = false }: Props) {
  const [text, setText] = useState('');
  const [error, setError] = useState<string | null>(null);

  async function proceed(id: IdentifyResult, clear: () => void) {
    if (!isIdentified(id)) {
      setError(id.error);
      return;
    }
    setError(null);
    if (onIdentified) {
      await onIdentified(id);
      clear();
    } else {
      window.location.assign(binHref(id));
    }
  }

  function submit(e: FormEvent) {
    e.preventDefault();
    void proceed(identify(text, prefixLength), () => setText(''));
  }

  return (
    <div className="space-y-3" data-scan-input>
      <QrCapture disabled={busy} keepOpen={keepCameraOpen} onDecoded={(decoded) => void proceed(identifyDecoded(decoded, prefixLength), () => undefined)} />
      {/* Before the script runs (slow signal), the form still works: the server's find-a-bin answers it. */}
      <form onSubmit={submit} action="/bins/find" method="get" className="space-y-2" noValidate>
        <label htmlFor="scan-text" className="label">
          {label}
        </label>
        <div className="flex gap-2">
          <input
            id="scan-text"
            name="q"
            className="field ident text-lg min-h-[56px]"
            inputMode="text"
            autoComplete="off"
            autoCapitalize="characters"
            spellCheck={false}
            value={text}
            onChange={(e) => setText(e.target.value)}
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? 'scan-error' : undefined}
            placeholder="0 9521234 10010 2 · 100528"
          />
          <button className="btn-primary min-h-[56px] px-5" type="submit" disabled={busy}>
            <Icon name="keyboard" /> <span className="sr-only sm:not-sr-only">Go</span>
          </button>
        </div>
      </form>
      {error && (
        <p id="scan-error" className="notice-fault" role="alert">
          {error}
        </p>
      )}
    </div>
  );
}
