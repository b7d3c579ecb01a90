import { endpoint } from '@/lib/endpoint.server';
import { inspectionBody } from '@/lib/inspections/inspection-schema';
import { recordInspection } from '@/lib/inspections/inspection-records.server';

/** Record an inspection at the test bench: the record and its `inspect` scan, in one transaction. */
export const POST = endpoint({ capability: 'inspections.record', body: inspectionBody, status: 201 }, async ({ user, body }) => recordInspection(user, body));
