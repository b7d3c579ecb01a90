// Everything that touches html5-qrcode. This module is only ever loaded with a
// dynamic import(), when the user opens the camera or picks a photo, so the
// decoder (~the largest script of the yard pages) never weighs on page load.
// html5-qrcode 2.3.8 is frozen upstream; its instance must be stopped (await
// stop()) before clear(), and clear() must not run while it scans.
import { Html5Qrcode, Html5QrcodeScannerState, Html5QrcodeSupportedFormats } from 'html5-qrcode';

const CONFIG = {
  formatsToSupport: [Html5QrcodeSupportedFormats.QR_CODE],
  verbose: false,
  // Android's built-in detector is faster and reads worn labels better than the bundled decoder.
  experimentalFeatures: { useBarCodeDetectorIfSupported: true },
};

export type QrReader = Html5Qrcode;

/** A reader that renders its video into the element with this id (the element must exist and have a width). */
export function createReader(elementId: string): QrReader {
  return new Html5Qrcode(elementId, CONFIG);
}

export async function startCamera(reader: QrReader, onText: (text: string) => void): Promise<void> {
  await reader.start(
    { facingMode: 'environment' },
    {
      fps: 10,
      qrbox: (w: number, h: number) => {
        const side = Math.max(120, Math.floor(Math.min(w, h) * 0.7));
        return { width: side, height: side };
      },
    },
    (text) => onText(text),
    () => {
      /* no code in this frame: keep looking */
    },
  );
}

export async function stopCamera(reader: QrReader): Promise<void> {
  const state = reader.getState();
  if (state === Html5QrcodeScannerState.SCANNING || state === Html5QrcodeScannerState.PAUSED) await reader.stop();
  reader.clear();
}

const MAX_PHOTO_SIDE = 2000;

/** A copy of the photo at most `maxSide` px on its longer side (the photo itself when it is that small already). */
async function scaledTo(file: File, maxSide: number): Promise<File> {
  if (typeof createImageBitmap !== 'function') return file;
  try {
    const bitmap = await createImageBitmap(file);
    const scale = maxSide / Math.max(bitmap.width, bitmap.height);
    if (scale >= 1) return file;
    const canvas = document.createElement('canvas');
    canvas.width = Math.round(bitmap.width * scale);
    canvas.height = Math.round(bitmap.height * scale);
    canvas.getContext('2d')?.drawImage(bitmap, 0, 0, canvas.width, canvas.height);
    const blob = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, 'image/jpeg', 0.92));
    return blob ? new File([blob], 'label.jpg', { type: 'image/jpeg' }) : file;
  } catch {
    return file;
  }
}

async function sideOf(file: File): Promise<number> {
  if (typeof createImageBitmap !== 'function') return 0;
  try {
    const bitmap = await createImageBitmap(file);
    return Math.max(bitmap.width, bitmap.height);
  } catch {
    return 0;
  }
}

/**
 * The text of the QR code in a photo; throws when there is none to read. Phone photos are 12 megapixels and more;
 * a label's QR reads as well, and much faster, from a smaller copy. The bundled decoder's finder-pattern search
 * depends on the module size in pixels, so a photo it cannot read is tried once more at half its size before
 * the reader gives up.
 */
export async function decodePhoto(elementId: string, file: File): Promise<string> {
  const first = await scaledTo(file, MAX_PHOTO_SIDE);
  const tries = [first];
  const side = await sideOf(first);
  if (side >= 400) tries.push(await scaledTo(first, Math.round(side / 2)));
  let failure: unknown = null;
  for (const photo of tries) {
    const reader = new Html5Qrcode(elementId, CONFIG);
    try {
      return await reader.scanFile(photo, false);
    } catch (e) {
      failure = e;
    } finally {
      reader.clear();
    }
  }
  throw failure;
}
