export const LOCAL_FAKE_KEYS: Readonly<{ secretKey: string; webhookSecret: string }>;
