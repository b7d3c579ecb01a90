// Importing the register from CSV: read the upload (size-capped, sniffed),
// check every line against the pool, and on commit register every bin in one
// transaction or none. The commit checks the file again inside its
// transaction, so a bin registered meanwhile refuses the whole file.
import { createHash } from 'node:crypto';
import { QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize';
import { Attachment, BinType, Site, sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import { groupGrai } from '@/lib/gs1';
import { decodeCsvUpload } from '@/lib/upload-sniff';
import { declaredLength, readBodyCapped } from '@/lib/http/body.server';
import { graisInLines, importCounts, parseRegisterCsv, validateImportLines, type CsvLine, type ImportLine, type RegisterLookups } from './register-csv';
import { registerBins } from './bin-register.server';
import { recordAudit } from '@/lib/audit.server';
import { getSettings } from '@/lib/settings/settings.server';
import type { Actor } from '@/lib/scans/scan-service.server';

export const MAX_IMPORT_BYTES = 5 * 1024 * 1024;
/** Lines sent back for the preview: every line with a problem first, then ready ones, up to this many. */
const PREVIEW_LINES = 1000;

function megabytes(bytes: number): string {
  return (bytes / (1024 * 1024)).toFixed(1).replace(/\.0$/, '');
}

function tooLarge(size: number | null, max: number): AppError {
  const what = size === null ? 'The file is larger than' : `The file is ${megabytes(size)} MB; the limit is`;
  return new AppError(
    'payload_too_large',
    `${what} ${megabytes(max)} MB for one register import. Split it into smaller files (each with the header line) and import them one after another. Nothing was registered.`,
    { maxBytes: max },
  );
}

/**
 * Reads the raw upload, refusing before parsing anything when it is too
 * large: first by its declared Content-Length, then by the bytes actually
 * received (a client may omit or understate the length).
 */
export async function readUpload(request: Request, maxBytes = MAX_IMPORT_BYTES): Promise<Uint8Array> {
  const declared = declaredLength(request);
  if (!request.body) throw new AppError('bad_request', 'Send the CSV file as the request body.');
  return readBodyCapped(request, maxBytes, () => tooLarge(declared !== null && declared > maxBytes ? declared : null, maxBytes));
}

function sha256(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/** The file's lines, or a refusal of the whole file (not CSV text, header problems). */
function linesOf(bytes: Uint8Array): CsvLine[] {
  const sniff = decodeCsvUpload(bytes);
  if (!sniff.ok) throw new AppError('unsupported_media_type', `${sniff.reason} Nothing was registered.`);
  const parsed = parseRegisterCsv(sniff.text);
  if (!parsed.ok) {
    throw new AppError('unprocessable', `${parsed.message} Nothing was registered.`, {
      fileProblem: parsed.code,
      missingColumns: parsed.missingColumns,
      unknownColumns: parsed.unknownColumns,
    });
  }
  return parsed.lines;
}

async function lookups(lines: CsvLine[], prefixLength: number, transaction?: Transaction): Promise<RegisterLookups> {
  const grais = graisInLines(lines, prefixLength);
  // One query at a time: inside the commit's transaction they share one connection.
  const types = await BinType.findAll({ transaction });
  const sites = await Site.findAll({ transaction });
  const taken = grais.length
    ? await sequelize.query<{ grai: string }>('SELECT grai FROM assets WHERE grai = ANY($1::text[])', { bind: [grais], type: QueryTypes.SELECT, transaction })
    : [];
  return {
    prefixLength,
    binTypes: new Map(types.map((t) => [t.code.toUpperCase(), { id: t.id, code: t.code, unCode: t.unCode, active: t.active }])),
    sites: new Map(sites.map((s) => [s.code.toUpperCase(), { id: s.id, code: s.code, kind: s.kind, active: s.active }])),
    registeredGrais: new Set(taken.map((r) => r.grai)),
  };
}

export interface PreviewLine {
  line: number;
  grai: string | null;
  groupedGrai: string | null;
  cells: CsvLine['cells'];
  issues: ImportLine['issues'];
}

export interface ImportPreview {
  sha256: string;
  byteSize: number;
  counts: { total: number; ready: number; withProblems: number };
  /** In file order; beyond PREVIEW_LINES lines, problem lines first, then ready ones, cut at PREVIEW_LINES. */
  lines: PreviewLine[];
  linesNotShown: number;
}

function previewOf(lines: ImportLine[], prefixLength: number, bytes: Uint8Array): ImportPreview {
  // Every line in file order when they fit; otherwise the problems first, so none is cut off.
  const shown = lines.length <= PREVIEW_LINES ? lines : [...lines.filter((l) => l.issues.length > 0), ...lines.filter((l) => l.issues.length === 0)].slice(0, PREVIEW_LINES);
  return {
    sha256: sha256(bytes),
    byteSize: bytes.byteLength,
    counts: importCounts(lines),
    lines: shown.map((l) => ({
      line: l.line,
      grai: l.grai,
      groupedGrai: l.grai ? groupGrai(l.grai, prefixLength) : null,
      cells: l.cells,
      issues: l.issues,
    })),
    linesNotShown: lines.length - shown.length,
  };
}

/** Checks a file without writing anything. */
export async function previewImport(bytes: Uint8Array): Promise<ImportPreview> {
  const settings = await getSettings();
  const lines = linesOf(bytes);
  const checked = validateImportLines(lines, await lookups(lines, settings.gs1PrefixLength));
  return previewOf(checked, settings.gs1PrefixLength, bytes);
}

/**
 * Registers every bin of the file in one transaction, or none. `expectedSha256`
 * is the preview's: a different file is refused rather than registered unseen.
 */
export async function commitImport(actor: Actor, bytes: Uint8Array, opts: { expectedSha256: string; filename: string | null; ip: string | null; now?: Date }) {
  const digest = sha256(bytes);
  if (digest !== opts.expectedSha256) {
    throw new AppError('conflict', 'This is not the file you previewed. Upload it again to see its preview, then register. Nothing was registered.');
  }
  const settings = await getSettings();
  const lines = linesOf(bytes);
  try {
    return await sequelize.transaction(async (t) => {
      const checked = validateImportLines(lines, await lookups(lines, settings.gs1PrefixLength, t));
      const counts = importCounts(checked);
      if (counts.withProblems > 0) {
        throw new AppError('unprocessable', `${counts.withProblems} of ${counts.total} lines have problems, so nothing was registered. Fix them in the file and upload it again.`, {
          preview: previewOf(checked, settings.gs1PrefixLength, bytes),
        });
      }
      const registered = await registerBins(
        actor,
        checked.map((l) => l.input!),
        { transaction: t, now: opts.now },
      );
      const file = await Attachment.create(
        {
          content: Buffer.from(bytes),
          contentType: 'text/csv',
          byteSize: bytes.byteLength,
          sha256: digest,
          filename: opts.filename?.slice(0, 200) ?? null,
          purpose: 'import',
          organisationId: actor.organisationId,
          uploadedBy: actor.id,
        },
        { transaction: t },
      );
      await recordAudit(
        {
          actor: { userId: actor.id, ip: opts.ip ?? null },
          action: 'bins.import',
          entityType: 'attachment',
          entityId: file.id,
          before: null,
          after: { registered, filename: file.filename, sha256: digest, firstGrai: checked[0]!.grai, lastGrai: checked[checked.length - 1]!.grai },
        },
        { transaction: t },
      );
      return { registered, attachmentId: file.id };
    });
  } catch (e) {
    if (e instanceof UniqueConstraintError) {
      throw new AppError('duplicate', 'Someone registered one of these GRAIs while the import ran, so nothing was registered. Upload the file again to see which line.');
    }
    throw e;
  }
}
