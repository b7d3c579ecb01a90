// Input shapes of the people API (invite, change), validated in one place.
import { z } from 'zod';
import { text } from '@/lib/text-input';
import { ROLES } from '@/lib/permissions';

const roleSchema = z.enum(ROLES);
const idSchema = z.number().int().positive();

export const inviteSchema = z.object({
  name: text().trim().min(1, 'Enter the person’s name.').max(160),
  email: text().trim().toLowerCase().email('Enter an e-mail address, like name@company.example.').max(254),
  role: roleSchema,
  organisationId: idSchema,
  homeSiteId: idSchema.nullable().default(null),
  qualifiedInspector: z.boolean().default(false),
});
export type InviteInput = z.infer<typeof inviteSchema>;

export const personPatchSchema = z
  .object({
    version: z.number().int().min(0),
    role: roleSchema.optional(),
    homeSiteId: idSchema.nullable().optional(),
    qualifiedInspector: z.boolean().optional(),
    active: z.boolean().optional(),
  })
  .refine((p) => p.role !== undefined || p.homeSiteId !== undefined || p.qualifiedInspector !== undefined || p.active !== undefined, {
    message: 'Nothing to change.',
  });
export type PersonPatch = z.infer<typeof personPatchSchema>;
