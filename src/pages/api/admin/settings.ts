import { endpoint } from '@/lib/endpoint.server';
import { settingsSchema } from '@/lib/settings/settings-schema';
import { readSettings, updateSettings } from '@/lib/settings/settings.server';
import { actorFrom } from '@/lib/audit.server';

export const GET = endpoint({ capability: 'settings.manage' }, async () => ({ settings: await readSettings() }));

/** Save the whole form; `version` must be the one the form was loaded with (else 409 changed_meanwhile). */
export const PUT = endpoint({ capability: 'settings.manage', body: settingsSchema }, async ({ ctx, body }) => ({
  settings: await updateSettings(body, actorFrom(ctx.locals)),
}));
