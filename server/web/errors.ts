import type { ErrorRequestHandler, Request, Response } from 'express';
import { ZodError } from 'zod';
import { ConvergenceError, InputError, PhysicsError, type IssueDetail } from '../core/errors.js';

/** Map zod issues to our {path, message} grammar. */
export function zodIssues(err: ZodError): IssueDetail[] {
  return err.issues.map((issue) => ({
    path: issue.path.map((p, i) => (typeof p === 'number' ? `[${p}]` : `${i === 0 ? '' : '.'}${String(p)}`)).join('') || '(body)',
    message: issue.message,
  }));
}

export interface ErrorBody {
  error: { message: string; issues: IssueDetail[] };
}

/** Classify any thrown value into an HTTP status and a body safe to show (no stack traces). */
export function describeError(err: unknown): { status: number; body: ErrorBody } {
  if (err instanceof ZodError) {
    const issues = zodIssues(err);
    return { status: 400, body: { error: { message: `Invalid input: ${issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`, issues } } };
  }
  if (err instanceof InputError || err instanceof PhysicsError) {
    return { status: 400, body: { error: { message: err.message, issues: err.issues } } };
  }
  if (err instanceof ConvergenceError) {
    return { status: 422, body: { error: { message: `The calculation did not converge: ${err.message}`, issues: [] } } };
  }
  const e = err as { type?: string; status?: number; message?: string };
  if (e && e.type === 'entity.too.large') {
    return { status: 413, body: { error: { message: 'Request body too large.', issues: [{ path: '(body)', message: 'exceeds the size limit' }] } } };
  }
  if (e && e.type === 'entity.parse.failed') {
    return { status: 400, body: { error: { message: 'Malformed JSON in request body.', issues: [{ path: '(body)', message: 'not valid JSON' }] } } };
  }
  if (e && typeof e.status === 'number' && e.status >= 400 && e.status < 500) {
    // Other refusals of the body parsers (bad encoding or charset, too many fields, aborted
    // upload…): they concern the body as a whole, so the issue names "(body)".
    const reason = e.message || 'bad request';
    const message = e.type ? `The request body could not be read: ${reason}.` : reason;
    return { status: e.status, body: { error: { message, issues: [{ path: '(body)', message: reason }] } } };
  }
  return { status: 500, body: { error: { message: 'Internal error. The problem has been logged.', issues: [] } } };
}

function wantsJson(req: Request): boolean {
  return req.path.startsWith('/api/') || (req.accepts(['html', 'json']) === 'json');
}

/** One error handler for the whole app: JSON for the API, an error page for people. */
export const errorHandler: ErrorRequestHandler = (err, req, res: Response, _next) => {
  const { status, body } = describeError(err);
  if (status >= 500) {
    console.error(`[${new Date().toISOString()}] ${req.method} ${req.originalUrl}:`, err);
  }
  if (res.headersSent) return;
  res.status(status);
  if (wantsJson(req)) {
    res.json(body);
  } else {
    res.render('error', { title: status >= 500 ? 'Something went wrong' : 'Input problem', status, error: body.error, study: null, nav: null });
  }
};

export function notFound(req: Request, res: Response): void {
  const body: ErrorBody = { error: { message: `No such page: ${req.method} ${req.path}`, issues: [] } };
  res.status(404);
  if (wantsJson(req)) res.json(body);
  else res.render('error', { title: 'Not found', status: 404, error: body.error, study: null, nav: null });
}
