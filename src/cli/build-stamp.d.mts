export const BUILD_SOURCES: string[];
export const BUILD_OUTPUTS: string[];
export const STAMP: string;
export function sourceDigest(root: string, sources?: string[]): string;
export function buildState(root: string, opts?: { sources?: string[]; outputs?: string[] }): { fresh: boolean; reason: string };
export function buildIfStale(
  root: string,
  opts?: { command: string; args?: string[]; env?: Record<string, string>; force?: boolean; sources?: string[]; outputs?: string[]; say?: (msg: string) => void },
): Promise<{ built: boolean; reason: string }>;
