export interface PayFake {
  port: number;
  base: string;
  sent: Array<{ id: string; type: string; data: { object: Record<string, unknown> } }>;
  deliveries: Array<{ event: { id: string; type: string }; payload: string; signature: string }>;
  sessions: Map<string, Record<string, unknown>>;
  close(): Promise<void>;
}
export function startPayFake(opts: { port?: number; secretKey: string; webhookSecret: string; webhookUrl: () => string | null; log?: (m: string) => void }): Promise<PayFake>;
