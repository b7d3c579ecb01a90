// Lays a label run out on sheets: each bin's QR (its GS1 Digital Link), the
// GRAI in reading groups and the serial, at the positions the stock defines.
import QRCode from 'qrcode';
import { graiToDigitalLink, groupGrai } from '@/lib/gs1';
import { LABEL_STOCKS, labelRect, planSheets, qrBox, type LabelRect, type LabelStock, type SheetPlan } from './label-stock';
import type { SheetOptions } from './label-selection';
import type { OperatorSettings } from '@/lib/settings/settings.server';

/**
 * Error correction level Q restores up to about a quarter of the symbol
 * (ISO/IEC 18004): labels in a yard get scuffed and splashed. The quiet zone
 * of 4 modules that the standard asks for is kept inside the SVG.
 */
const QR_ERROR_CORRECTION = 'Q' as const;
const QR_QUIET_ZONE_MODULES = 4;

export interface PrintedLabel {
  binId: number;
  grai: string;
  /** The GRAI split for reading: [fixed digits in groups, '· serial']. */
  graiGroups: [string, string];
  serial: string;
  link: string;
  qrSvg: string;
}

export interface SheetSlotView {
  rect: LabelRect;
  /** Absent for a position left blank (before the start position, or after the last label). */
  label?: PrintedLabel;
  /** True for a position skipped because the sheet is part-used. */
  used: boolean;
}

export interface LabelSheets {
  stock: LabelStock;
  plan: SheetPlan;
  qr: ReturnType<typeof qrBox>;
  operatorName: string;
  sheets: SheetSlotView[][];
}

/** The QR as an inline SVG that fills its box (viewBox in modules, quiet zone included). */
export async function qrSvg(text: string, title: string): Promise<string> {
  const svg = await QRCode.toString(text, {
    type: 'svg',
    errorCorrectionLevel: QR_ERROR_CORRECTION,
    margin: QR_QUIET_ZONE_MODULES,
    color: { dark: '#000000ff', light: '#ffffffff' },
  });
  const escaped = title.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/"/g, '&quot;');
  return svg
    .trim()
    .replace(/^<svg /, `<svg width="100%" height="100%" role="img" aria-label="${escaped}" `)
    .replace(/^(<svg[^>]*>)/, `$1<title>${escaped}</title>`);
}

/** The GRAI in two pieces that each stay on one line; the separator ends the first, so no line starts with it. */
function splitGroups(grouped: string): [string, string] {
  const at = grouped.indexOf(' \u00B7 ');
  return at < 0 ? [grouped, ''] : [`${grouped.slice(0, at)} \u00B7`, grouped.slice(at + 3)];
}

export async function buildLabelSheets(
  bins: ReadonlyArray<{ id: number; grai: string; serial: string }>,
  options: SheetOptions,
  settings: Pick<OperatorSettings, 'digitalLinkBase' | 'gs1PrefixLength' | 'operatorName'>,
): Promise<LabelSheets> {
  const stock = LABEL_STOCKS[options.stock];
  const plan = planSheets(stock, bins.length, options.startAt);
  const labels: PrintedLabel[] = [];
  for (const bin of bins) {
    const link = graiToDigitalLink(bin.grai, settings.digitalLinkBase);
    labels.push({
      binId: bin.id,
      grai: bin.grai,
      graiGroups: splitGroups(groupGrai(bin.grai, settings.gs1PrefixLength)),
      serial: bin.serial,
      link,
      qrSvg: await qrSvg(link, `QR code for bin ${bin.serial}: ${link}`),
    });
  }
  const perSheet = stock.columns * stock.rows;
  const sheets: SheetSlotView[][] = [];
  for (let s = 0; s < plan.sheets; s++) {
    sheets.push(Array.from({ length: perSheet }, (_, i) => ({ rect: labelRect(stock, i + 1), used: s === 0 && i < plan.skipped })));
  }
  for (const slot of plan.slots) {
    const view = sheets[slot.sheet]![slot.position - 1]!;
    view.label = labels[slot.item];
  }
  return { stock, plan, qr: qrBox(stock), operatorName: settings.operatorName, sheets };
}
