import { z } from 'zod';
import { email } from './people';

/** A member added to or removed from a project, by address. */
export const memberSchema = z.object({ email }).strict();

/** PATCH /api/v1/projects/{id}: the lead who decides, by address; null lets any lead decide. */
export const projectPatchSchema = z.object({ leadEmail: z.preprocess((v) => (v === '' ? null : v), email.nullable()) }).strict();
