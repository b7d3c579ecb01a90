// Reading a bin's QR label: live through the camera, or from a photo taken
// with the phone's own camera app. The decoder is loaded only when one of the
// two opens (dynamic import of src/lib/yard/qr-reader.client.ts). The live camera
// needs a secure context (HTTPS, or localhost); on plain HTTP the photo route
// still works, and the screen says so.
import { useEffect, useId, useRef, useState, type ChangeEvent } from 'react';
import { Icon } from '@/components/ui/Icon';
import type { QrReader } from '@/lib/yard/qr-reader.client';

type Mode = 'idle' | 'starting' | 'live' | 'reading';

const loadReader = () => import('@/lib/yard/qr-reader.client');

const INSECURE =
  'The live camera works only over a secure connection (an https:// address). This page was opened over plain http, so use “Photo” to take a picture of the label instead. Your administrator can switch the yard network to HTTPS (README: “Phones on the yard: HTTPS”).';

function cameraError(err: unknown): string {
  const text = String((err as { name?: string })?.name ?? err);
  if (/NotAllowed|Permission/i.test(text)) return 'The camera is blocked for Loopfold. Allow it in the browser’s site settings, or take a photo of the label instead.';
  if (/NotFound|Overconstrained|DevicesNotFound/i.test(text)) return 'No camera was found on this device. Take a photo of the label, or type the GRAI.';
  if (/NotReadable|TrackStart/i.test(text)) return 'The camera is in use by another app. Close it and try again, or take a photo of the label.';
  return 'The camera could not be started. Take a photo of the label, or type the GRAI.';
}

/** The same code seen again within this time is the same label still in view, not a second scan. */
const REPEAT_MS = 2_500;

export default function QrCapture({ onDecoded, disabled = false, keepOpen = false }: { onDecoded: (text: string) => void; disabled?: boolean; keepOpen?: boolean }) {
  const base = useId().replace(/[^A-Za-z0-9]/g, '');
  const liveId = `qr-live-${base}`;
  const photoId = `qr-photo-${base}`;
  const [mode, setMode] = useState<Mode>('idle');
  const [secure, setSecure] = useState(true);
  const [notice, setNotice] = useState<string | null>(null);
  // Until React has taken over the server's HTML, a picked photo would go nowhere: the buttons stay disabled.
  const [ready, setReady] = useState(false);
  const reader = useRef<QrReader | null>(null);
  const handled = useRef(false);
  const last = useRef<{ text: string; at: number } | null>(null);
  // The camera callback outlives renders: always hand codes to the latest handler.
  const report = useRef(onDecoded);
  report.current = onDecoded;

  useEffect(() => {
    setReady(true);
    setSecure(window.isSecureContext && typeof navigator.mediaDevices?.getUserMedia === 'function');
    return () => {
      const r = reader.current;
      reader.current = null;
      if (r)
        void loadReader()
          .then((m) => m.stopCamera(r))
          .catch(() => undefined);
    };
  }, []);

  async function closeCamera() {
    const r = reader.current;
    reader.current = null;
    setMode('idle');
    if (r) {
      const m = await loadReader();
      await m.stopCamera(r).catch(() => undefined);
    }
  }

  async function openCamera() {
    setNotice(null);
    if (!secure) {
      setNotice(INSECURE);
      return;
    }
    setMode('starting');
    handled.current = false;
    try {
      const m = await loadReader();
      const r = m.createReader(liveId);
      reader.current = r;
      last.current = null;
      await m.startCamera(r, (text) => {
        if (keepOpen) {
          const now = Date.now();
          if (last.current?.text === text && now - last.current.at < REPEAT_MS) return;
          last.current = { text, at: now };
          report.current(text);
          return;
        }
        if (handled.current) return;
        handled.current = true;
        void closeCamera().then(() => report.current(text));
      });
      setMode('live');
    } catch (err) {
      reader.current = null;
      setMode('idle');
      setNotice(err instanceof TypeError ? 'The scanner could not be loaded without a connection. Take a photo later, or type the GRAI.' : cameraError(err));
    }
  }

  async function readPhoto(e: ChangeEvent<HTMLInputElement>) {
    const file = e.target.files?.[0];
    e.target.value = ''; // the same photo may be picked again
    if (!file) return;
    setNotice(null);
    setMode('reading');
    try {
      const m = await loadReader();
      const text = await m.decodePhoto(photoId, file);
      setMode('idle');
      onDecoded(text);
    } catch (err) {
      setMode('idle');
      setNotice(
        err instanceof TypeError && /import|fetch|module/i.test(err.message)
          ? 'The scanner could not be loaded without a connection. Type the GRAI printed under the code.'
          : 'No QR code could be read in that photo. Hold the phone 20–40 cm from the label, keep it flat and sharp, and try again, or type the GRAI.',
      );
    }
  }

  const busy = mode !== 'idle' || disabled || !ready;
  return (
    <div className="space-y-2" data-qr-capture>
      <div className="grid grid-cols-2 gap-2">
        <button
          type="button"
          className="btn-primary min-h-[56px]"
          onClick={() => void openCamera()}
          disabled={busy}
          data-open-camera
          aria-label="Camera: scan the QR label live"
          aria-describedby={!secure ? `${base}-insecure` : undefined}
        >
          <Icon name="camera" /> Camera
        </button>
        <label
          htmlFor={`${photoId}-input`}
          aria-label="Photo: take a picture of the QR label"
          className={`btn-quiet min-h-[56px] cursor-pointer ${busy ? 'pointer-events-none opacity-60' : ''}`}
        >
          <Icon name="label" /> {mode === 'reading' ? 'Reading…' : 'Photo'}
        </label>
        <input
          id={`${photoId}-input`}
          type="file"
          accept="image/*"
          capture="environment"
          className="sr-only"
          onChange={(e) => void readPhoto(e)}
          disabled={busy}
          data-photo-input
          data-ready={ready ? '' : undefined}
        />
      </div>
      {!secure && (
        <p id={`${base}-insecure`} className="text-sm text-ink-soft">
          Live camera: needs HTTPS on this network. Use “Photo”.
        </p>
      )}
      <div className={mode === 'starting' || mode === 'live' ? 'space-y-2' : 'hidden'} data-camera-view={mode}>
        <div id={liveId} role="region" className="w-full overflow-hidden rounded-md bg-ink min-h-[240px]" aria-label="Camera view: point it at the bin’s QR label" />
        <button type="button" className="btn-quiet w-full" onClick={() => void closeCamera()}>
          Close camera
        </button>
      </div>
      {/* html5-qrcode draws a photo into an element of its own while it decodes; it stays out of sight. */}
      <div id={photoId} className="hidden" aria-hidden="true" />
      {notice && (
        <p className="notice-attention" role="alert" data-capture-notice>
          {notice}
        </p>
      )}
    </div>
  );
}
