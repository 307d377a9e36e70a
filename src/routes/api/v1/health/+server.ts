import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

// Public and cheap: load balancers call it often. It does not touch the database.
export const GET: RequestHandler = () => json({ ok: true });
