export function workerDatabaseUrl(url: string | undefined, poolId: string | undefined): string | undefined;
export function workerDatabaseName(name: string, worker: number): string;
