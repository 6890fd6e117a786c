import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

// Public on purpose: load balancers and the benchmarks' floor call it without signing in.
export const GET: RequestHandler = () => json({ ok: true });
