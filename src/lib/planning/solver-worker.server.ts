/**
 * The body of the planning solver's worker thread (started by `plan-solver.server.ts`, never imported by
 * request code). HiGHS blocks the thread it runs on; here that thread is this worker, so the server's event
 * loop keeps answering while a plan is solved. One job at a time, in the order they arrive.
 */
import { parentPort } from 'node:worker_threads';
import { PlanInputError, loadSolver, solveTransportation, solveTruckPlan } from './transport-plan';
import type { SolveOptions, TransportationInput, TruckPlanInput } from './transport-plan';

export type SolverJob =
  | { id: number; kind: 'transportation'; input: TransportationInput; options?: SolveOptions }
  | { id: number; kind: 'truck-plan'; input: TruckPlanInput; options?: SolveOptions };

export type SolverReply = { id: number; ok: true; result: unknown } | { id: number; ok: false; error: { name: string; message: string } };

if (!parentPort) throw new Error('solver-worker.server.ts runs only as a worker thread');
const port = parentPort;

port.on('message', async (job: SolverJob) => {
  let reply: SolverReply;
  try {
    const result = job.kind === 'transportation' ? await solveTransportation(job.input, job.options) : await solveTruckPlan(job.input, job.options);
    reply = { id: job.id, ok: true, result };
  } catch (error) {
    const e = error instanceof Error ? error : new Error(String(error));
    reply = { id: job.id, ok: false, error: { name: e instanceof PlanInputError ? 'PlanInputError' : e.name, message: e.message } };
  }
  port.postMessage(reply);
});

// Load the WebAssembly now, so the first job does not pay for it; then say we are ready.
loadSolver().then(
  () => port.postMessage({ ready: true }),
  (error: unknown) => port.postMessage({ ready: false, message: String(error) }),
);
