import { useEffect, useRef, useState, type ChangeEvent } from 'react';
import { ApiError } from '@/lib/api.client';
import type { ErrorCode } from '@/lib/api-errors';
import type { ImportPreview, PreviewLine } from '@/lib/bins/register-import.server';
import { Icon } from '@/components/ui/Icon';

type Phase = 'idle' | 'checking' | 'preview' | 'registering' | 'done';

interface FileProblem {
  message: string;
  missingColumns?: string[];
}

function megabytes(bytes: number): string {
  return (bytes / (1024 * 1024)).toFixed(1).replace(/\.0$/, '');
}

/** Sends the file itself as the body (the server sniffs its bytes) and unwraps the { data } / { error } envelope. */
async function upload<T>(path: string, file: File): Promise<T> {
  let res: Response;
  try {
    res = await fetch(path, { method: 'POST', credentials: 'same-origin', headers: { 'Content-Type': 'text/csv', Accept: 'application/json' }, body: file });
  } catch {
    throw new ApiError('network', 'Loopfold could not be reached, or it closed the connection. Check your connection and try again.', 0);
  }
  let payload: { data?: T; error?: { code: ErrorCode; message: string; details?: unknown } };
  try {
    payload = await res.json();
  } catch {
    throw new ApiError('bad_response', `The server answered in a way this page does not understand (HTTP ${res.status}).`, res.status);
  }
  if (payload.error) throw new ApiError(payload.error.code, payload.error.message, res.status, payload.error.details);
  return payload.data as T;
}

function Cell({ value, mono = false }: { value: string; mono?: boolean }) {
  return value ? <span className={mono ? 'ident' : ''}>{value}</span> : <span className="text-ink-faint">—</span>;
}

function LineRow({ l }: { l: PreviewLine }) {
  const ok = l.issues.length === 0;
  const tests = [l.cells.last_intermediate_test_month, l.cells.last_full_inspection_month].map((m) => m || '—').join(' / ');
  return (
    <tr className={ok ? '' : 'bg-brick-tint/50'} data-line={l.line} data-ok={ok ? 'yes' : 'no'}>
      <td className="num px-3 py-2 align-top font-medium">{l.line}</td>
      <td className="px-3 py-2 align-top min-w-[15rem] max-w-[24rem]">
        {ok ? (
          <span className="inline-flex items-center gap-1 text-moss">
            <Icon name="check" size={16} /> Ready
          </span>
        ) : (
          <ul className="space-y-1">
            {l.issues.map((i, n) => (
              <li key={n} className="flex items-start gap-1 text-ink">
                <Icon name="alert" size={16} className="mt-0.5 shrink-0 text-brick" />
                <span>
                  {i.column && <span className="font-mono text-xs font-medium">{i.column}: </span>}
                  {i.message}
                </span>
              </li>
            ))}
          </ul>
        )}
      </td>
      <td className="px-3 py-2 align-top whitespace-nowrap">
        <Cell value={l.groupedGrai ?? l.cells.grai} mono />
      </td>
      <td className="px-3 py-2 align-top whitespace-nowrap">
        <Cell value={l.cells.bin_type} />
      </td>
      <td className="px-3 py-2 align-top whitespace-nowrap">
        <Cell value={l.cells.depot} />
      </td>
      <td className="num px-3 py-2 align-top whitespace-nowrap">
        <Cell value={l.cells.manufacture_month} />
      </td>
      <td className="px-3 py-2 align-top whitespace-nowrap">
        <Cell value={l.cells.un_marking} mono />
      </td>
      <td className="num px-3 py-2 align-top whitespace-nowrap">{tests}</td>
    </tr>
  );
}

/** Upload a register CSV, see every line with its problems, then register all of it or nothing. */
export default function ImportPanel({ maxBytes }: { maxBytes: number }) {
  const [phase, setPhase] = useState<Phase>('idle');
  const [file, setFile] = useState<File | null>(null);
  const [preview, setPreview] = useState<ImportPreview | null>(null);
  const [problem, setProblem] = useState<FileProblem | null>(null);
  const [registered, setRegistered] = useState(0);
  const [onlyProblems, setOnlyProblems] = useState(false);
  const input = useRef<HTMLInputElement>(null);
  // Rendered disabled on the server: a file chosen before the page's script runs would go unchecked.
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);

  function fail(err: unknown) {
    if (err instanceof ApiError) {
      const details = (err.details ?? {}) as { missingColumns?: string[]; preview?: ImportPreview };
      if (details.preview) {
        setPreview(details.preview);
        setPhase('preview');
      } else setPhase('idle');
      setProblem({ message: err.message, missingColumns: details.missingColumns?.length ? details.missingColumns : undefined });
    } else {
      setPhase('idle');
      setProblem({ message: 'Something went wrong. Try again.' });
    }
  }

  async function check(e: ChangeEvent<HTMLInputElement>) {
    const chosen = e.target.files?.[0] ?? null;
    setFile(chosen);
    setPreview(null);
    setProblem(null);
    setOnlyProblems(false);
    if (!chosen) return setPhase('idle');
    if (chosen.size > maxBytes) {
      setPhase('idle');
      setProblem({
        message: `The file is ${megabytes(chosen.size)} MB; the limit is ${megabytes(maxBytes)} MB for one register import. Split it into smaller files (each with the header line) and import them one after another. Nothing was registered.`,
      });
      return;
    }
    setPhase('checking');
    try {
      const result = await upload<ImportPreview>(`/api/bins/import/preview?name=${encodeURIComponent(chosen.name)}`, chosen);
      setPreview(result);
      setPhase('preview');
    } catch (err) {
      fail(err);
    }
  }

  async function commit() {
    if (!file || !preview) return;
    setPhase('registering');
    setProblem(null);
    try {
      const result = await upload<{ registered: number }>(`/api/bins/import/commit?sha256=${preview.sha256}&name=${encodeURIComponent(file.name)}`, file);
      setRegistered(result.registered);
      setPhase('done');
    } catch (err) {
      fail(err);
    }
  }

  function again() {
    setPhase('idle');
    setFile(null);
    setPreview(null);
    setProblem(null);
    if (input.current) input.current.value = '';
  }

  if (phase === 'done') {
    return (
      <div className="card p-6" role="status" id="import-done">
        <p className="flex items-center gap-2 text-lg font-semibold text-moss">
          <Icon name="check" /> {registered.toLocaleString('en-GB')} bins registered
        </p>
        <p className="mt-1 text-ink-soft">All lines of {file?.name} are in the register, available at their depots. The file is kept with the audit trail.</p>
        <div className="mt-5 flex flex-wrap gap-3">
          <a className="btn-primary" href="/bins/export.csv" download>
            Export the register (CSV)
          </a>
          <button type="button" className="btn-quiet" onClick={again} id="import-another">
            Import another file
          </button>
        </div>
      </div>
    );
  }

  const counts = preview?.counts;
  const lines = preview ? (onlyProblems ? preview.lines.filter((l) => l.issues.length) : preview.lines) : [];
  return (
    <div className="space-y-4">
      <div className="card p-5">
        <label className="label" htmlFor="import-file">
          CSV file (up to {megabytes(maxBytes)} MB)
        </label>
        <input
          ref={input}
          id="import-file"
          type="file"
          accept=".csv,text/csv"
          onChange={check}
          disabled={!ready || phase === 'checking' || phase === 'registering'}
          className="block w-full text-sm file:mr-4 file:min-h-touch file:rounded-md file:border-0 file:bg-kelp file:px-4 file:font-medium file:text-white hover:file:bg-kelp-hover"
        />
        {phase === 'checking' && (
          <p className="mt-3 text-ink-soft" role="status">
            Checking every line…
          </p>
        )}
      </div>

      {problem && (
        <div className="notice-fault" role="alert" id="import-problem">
          <p className="flex items-start gap-2">
            <Icon name="alert" className="mt-0.5 shrink-0" /> <span>{problem.message}</span>
          </p>
          {problem.missingColumns && (
            <p className="mt-2" id="missing-columns">
              Missing:{' '}
              {problem.missingColumns.map((c) => (
                <code key={c} className="mr-2 rounded bg-card px-1 font-mono">
                  {c}
                </code>
              ))}
            </p>
          )}
        </div>
      )}

      {preview && counts && (
        <section className="card" aria-labelledby="preview-heading">
          <div className="flex flex-wrap items-center justify-between gap-3 border-b border-paper-line p-5">
            <div>
              <h2 id="preview-heading">Preview of {file?.name}</h2>
              <p className="mt-1 text-ink-soft" id="import-counts">
                <span className="num">{counts.total.toLocaleString('en-GB')}</span> lines · <span className="num text-moss">{counts.ready.toLocaleString('en-GB')} ready</span> ·{' '}
                <span className={counts.withProblems ? 'num font-medium text-brick' : 'num'}>{counts.withProblems.toLocaleString('en-GB')} with problems</span>
              </p>
            </div>
            <button type="button" className="btn-primary" onClick={commit} disabled={counts.withProblems > 0 || phase === 'registering'} id="import-commit">
              {phase === 'registering' ? 'Registering…' : `Register ${counts.ready.toLocaleString('en-GB')} bin${counts.ready === 1 ? '' : 's'}`}
            </button>
          </div>
          {counts.withProblems > 0 ? (
            <p className="notice-attention m-5" id="import-blocked">
              Nothing is registered while any line has a problem: the file goes in whole or not at all. Fix the lines marked below in your spreadsheet (line numbers are its row
              numbers; the header is line 1), save as CSV and choose the file again.
            </p>
          ) : (
            <p className="notice-good m-5">Every line is ready. Registering puts all {counts.total.toLocaleString('en-GB')} bins into the pool in one go.</p>
          )}
          {counts.withProblems > 0 && counts.ready > 0 && (
            <label className="mx-5 mb-3 inline-flex min-h-touch items-center gap-2 text-sm">
              <input type="checkbox" checked={onlyProblems} onChange={(e) => setOnlyProblems(e.target.checked)} id="only-problems" /> Show only lines with problems
            </label>
          )}
          <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Lines of the file (the table scrolls sideways)">
            <table className="w-full text-left text-sm" id="import-preview">
              <thead className="whitespace-nowrap bg-paper text-ink-soft">
                <tr>
                  <th scope="col" className="px-3 py-2">
                    Line
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Check
                  </th>
                  <th scope="col" className="px-3 py-2">
                    GRAI
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Bin type
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Depot
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Made
                  </th>
                  <th scope="col" className="px-3 py-2">
                    UN mark
                  </th>
                  <th scope="col" className="px-3 py-2">
                    Last tests (int. / full)
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-paper-line">
                {lines.map((l) => (
                  <LineRow key={l.line} l={l} />
                ))}
              </tbody>
            </table>
          </div>
          {preview.linesNotShown > 0 && (
            <p className="p-5 text-sm text-ink-soft">{preview.linesNotShown.toLocaleString('en-GB')} more lines are not shown here; lines with problems always come first.</p>
          )}
        </section>
      )}
    </div>
  );
}
