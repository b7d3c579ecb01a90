import { z } from 'zod';
import { text } from '@/lib/text-input';
import { endpoint } from '@/lib/endpoint.server';
import { dispatchLoad, loadIdByReference } from '@/lib/loads/load-service.server';

const body = z
  .object({
    carrier: text().trim().min(2, 'Name the carrier.').max(120),
    vehicleRegistration: text()
      .trim()
      .min(2, 'Give the vehicle registration.')
      .max(20)
      .regex(/^[A-Za-z0-9 -]+$/, 'Registrations use letters, digits, spaces and hyphens.'),
    driverName: text().trim().max(120).optional(),
    trailerSeals: z.array(text().trim().min(1).max(32)).max(6).default([]),
    trailerId: z.number({ message: 'Choose a trailer from the list.' }).int().positive().nullable().optional(),
  })
  .strict();

/** The truck leaves: record the carrier's details; the dispatch note can be printed. */
export const POST = endpoint({ capability: 'loads.manage', body }, async ({ ctx, body }) => {
  const done = await dispatchLoad(await loadIdByReference(ctx.params.ref ?? ''), body);
  return { reference: done.reference, status: done.status };
});
