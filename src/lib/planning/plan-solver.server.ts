/**
 * Runs the planning solvers (`transport-plan.ts`) on a worker thread, so a solve never blocks a request.
 *
 *   solveTransportationOffThread(input, options?)  → same answer as solveTransportation
 *   solveTruckPlanOffThread(input, options?)       → same answer as solveTruckPlan
 *   stopPlanSolver()                               → ends the worker (tests, shutdown)
 *
 * One worker per process, started on first use and kept (loading TypeScript and the WebAssembly takes a
 * second or so); jobs queue in it and run one at a time, which also keeps a solve to one of the machine's
 * cores. A job that outlives its time limits plus a margin ends the worker (a fresh one starts for the next
 * job) and fails with a clear message. Bad input fails with a PlanInputError, as in the pure module.
 *
 * The worker's body is TypeScript run from the source tree (`solver-worker.server.ts`) through tsx's API, as
 * the job worker is; the app server runs from the project folder, so the file is found there.
 */
import { Worker } from 'node:worker_threads';
import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { DEFAULT_TIME_LIMIT_SECONDS, PlanInputError } from './transport-plan';
import type { SolveOptions, TransportationInput, TransportationResult, TruckPlanInput, TruckPlanResult } from './transport-plan';
import type { SolverJob, SolverReply } from './solver-worker.server';

const WORKER_FILE = 'src/lib/planning/solver-worker.server.ts';
/** Time for the worker to start (tsx, WebAssembly) and to build the model, beyond the solver's own limits. */
const MARGIN_MS = 30_000;

function projectRoot(): string {
  // From source (tests, tsx) this file sits in src/lib/planning; bundled into dist/ it does not, and the
  // server runs from the project folder.
  try {
    const here = dirname(fileURLToPath(import.meta.url));
    const fromHere = resolve(here, '../../..');
    if (existsSync(join(fromHere, WORKER_FILE))) return fromHere;
  } catch {
    // import.meta.url is not a file URL in some bundles: fall through
  }
  const root = process.env.LOOPFOLD_ROOT ?? process.cwd();
  if (!existsSync(join(root, WORKER_FILE))) {
    throw new Error(`planning solver: ${WORKER_FILE} not found under ${root} (set LOOPFOLD_ROOT to the project folder)`);
  }
  return root;
}

function tsxApiUrl(root: string): string {
  const req = createRequire(join(root, 'package.json'));
  const pkgPath = req.resolve('tsx/package.json');
  const pkg = JSON.parse(readFileSync(pkgPath, 'utf8')) as { exports: Record<string, { import: { default: string } }> };
  return pathToFileURL(join(dirname(pkgPath), pkg.exports['./esm/api'].import.default)).href;
}

interface Pending {
  resolve: (value: unknown) => void;
  reject: (error: Error) => void;
  timer: NodeJS.Timeout;
}

let worker: Worker | null = null;
let nextId = 1;
const pending = new Map<number, Pending>();

function failAll(error: Error) {
  for (const [id, p] of pending) {
    clearTimeout(p.timer);
    p.reject(error);
    pending.delete(id);
  }
}

function startWorker(): Worker {
  const root = projectRoot();
  const workerUrl = pathToFileURL(join(root, WORKER_FILE)).href;
  const parentUrl = pathToFileURL(join(root, 'package.json')).href;
  const code = `import(${JSON.stringify(tsxApiUrl(root))}).then(({ tsImport }) => tsImport(${JSON.stringify(workerUrl)}, ${JSON.stringify(parentUrl)}))`;
  const w = new Worker(code, { eval: true });
  w.on('message', (message: SolverReply | { ready: boolean; message?: string }) => {
    if ('ready' in message) {
      if (!message.ready) failAll(new Error(`planning solver could not load HiGHS: ${message.message}`));
      return;
    }
    const p = pending.get(message.id);
    if (!p) return;
    pending.delete(message.id);
    clearTimeout(p.timer);
    if (pending.size === 0) w.unref();
    if (message.ok) p.resolve(message.result);
    else if (message.error.name === 'PlanInputError') p.reject(new PlanInputError(message.error.message));
    else p.reject(new Error(`planning solver failed: ${message.error.message}`));
  });
  w.on('error', (error: Error) => {
    if (worker === w) worker = null;
    failAll(new Error(`planning solver worker stopped: ${error.message}`));
  });
  w.on('exit', (code) => {
    if (worker === w) worker = null;
    failAll(new Error(`planning solver worker exited (code ${code})`));
  });
  w.unref();
  return w;
}

function submit<T>(job: Omit<SolverJob, 'id'>, steps: number): Promise<T> {
  worker ??= startWorker();
  const w = worker;
  const id = nextId++;
  const limitSeconds = job.options?.timeLimit ?? DEFAULT_TIME_LIMIT_SECONDS;
  // Each step is bounded by the time limit, and the LP steps of a truck plan by at least 30 s (see
  // transport-plan.ts): allow all of that before giving up on the worker.
  const limit = Number.isFinite(limitSeconds) && limitSeconds > 0 ? limitSeconds : DEFAULT_TIME_LIMIT_SECONDS;
  const budgetMs = (limit * steps + 60) * 1000 + MARGIN_MS;
  return new Promise<T>((resolvePromise, reject) => {
    const timer = setTimeout(() => {
      pending.delete(id);
      reject(new Error(`planning solver gave no answer within ${Math.round(budgetMs / 1000)} s; the worker was restarted`));
      if (worker === w) worker = null;
      void w.terminate();
    }, budgetMs);
    timer.unref();
    pending.set(id, { resolve: resolvePromise as (value: unknown) => void, reject, timer });
    w.ref();
    w.postMessage({ ...job, id });
  });
}

/** solveTransportation on the solver's worker thread. */
export function solveTransportationOffThread(input: TransportationInput, options?: SolveOptions): Promise<TransportationResult> {
  return submit<TransportationResult>({ kind: 'transportation', input, options }, 2);
}

/** solveTruckPlan on the solver's worker thread. */
export function solveTruckPlanOffThread(input: TruckPlanInput, options?: SolveOptions): Promise<TruckPlanResult> {
  return submit<TruckPlanResult>({ kind: 'truck-plan', input, options }, 2);
}

/** Ends the worker; jobs still waiting fail. The next solve starts a new one. */
export async function stopPlanSolver(): Promise<void> {
  const w = worker;
  worker = null;
  if (w) await w.terminate();
}
