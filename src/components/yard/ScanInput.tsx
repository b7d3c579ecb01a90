// Identify a bin: type the GRAI (checked as you type, so a misread digit is
// caught at once) or the serial printed under the code, or paste a label link.
// Camera and photo decoding plug in beside the typed entry.
import { useState, type FormEvent } from 'react';
import { parseGrai } from '../../lib/gs1';
import { Icon } from '../ui/Icon';

export interface Identified {
  /** Canonical GRAI when the text was one; otherwise the serial as typed. */
  grai: string | null;
  serial: string | null;
}

interface Props {
  prefixLength: number;
  /** Without a handler the page opens the bin. */
  onIdentified?: (id: Identified) => void | Promise<void>;
  label?: string;
  busy?: boolean;
}

export function identify(text: string, prefixLength: number): Identified | { error: string } {
  const t = text.trim();
  if (!t) return { error: 'Type the GRAI from the label, or the serial under the code.' };
  const parsed = parseGrai(t, { companyPrefixLength: prefixLength });
  if (parsed.ok) {
    if (!parsed.grai.serial) return { error: 'This GRAI has no serial part; a bin’s label always carries one.' };
    return { grai: parsed.grai.value, serial: null };
  }
  const digits = t.replace(/[\s.·()-]/g, '');
  if (/^\d{13,}$/.test(digits) || t.includes('8003') || t.startsWith('urn:')) return { error: parsed.error.message };
  if (/^[!-~]{1,16}$/.test(t)) return { grai: null, serial: t };
  return { error: 'That is neither a GRAI nor a serial.' };
}

export default function ScanInput({ prefixLength, onIdentified, label = 'Type the GRAI or serial', busy = false }: Props) {
  const [text, setText] = useState('');
  const [error, setError] = useState<string | null>(null);

  async function submit(e: FormEvent) {
    e.preventDefault();
    const id = identify(text, prefixLength);
    if ('error' in id) {
      setError(id.error);
      return;
    }
    setError(null);
    if (onIdentified) {
      await onIdentified(id);
      setText('');
    } else {
      window.location.assign(id.grai ? `/bins/${id.grai}` : `/bins/find?q=${encodeURIComponent(id.serial!)}`);
    }
  }

  return (
    <form onSubmit={submit} className="space-y-2" data-scan-input noValidate>
      <label htmlFor="scan-text" className="label">
        {label}
      </label>
      <div className="flex gap-2">
        <input
          id="scan-text"
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
      {error && (
        <p id="scan-error" className="notice-fault" role="alert">
          {error}
        </p>
      )}
    </form>
  );
}
