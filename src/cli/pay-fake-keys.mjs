// The keys `npm start` and `npm test` give both the app and the local payment provider fake (test keys, never a
// real provider's). No imports: start.mjs reads it before the dependencies are installed.
export const LOCAL_FAKE_KEYS = Object.freeze({ secretKey: 'sk_test_loopfold_local_fake', webhookSecret: 'whsec_loopfold_local_fake' });
