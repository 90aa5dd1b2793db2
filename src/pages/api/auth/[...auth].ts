import type { APIRoute } from 'astro';
import { handleAuthRequest } from '../../../lib/auth/handler';

/**
 * Auth.js's standard routes: GET csrf, session, providers; POST callback/credentials,
 * signin/nodemailer, signout; GET callback/nodemailer (the e-mailed link).
 */
export const GET: APIRoute = (context) => handleAuthRequest(context);
export const POST: APIRoute = (context) => handleAuthRequest(context);
