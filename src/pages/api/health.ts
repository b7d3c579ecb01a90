import { publicEndpoint } from '@/lib/endpoint.server';
import { health } from '@/lib/health.server';

/** Liveness and database reachability, for load balancers and the start script. */
export const GET = publicEndpoint({}, () => health());
