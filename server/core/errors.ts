/**
 * Error kinds of the numerical core. One class per kind; the web layer maps each to an
 * HTTP answer in one place (server/web/errors.ts).
 *
 * - InputError: a value the user gave is malformed or out of its allowed range.
 * - PhysicsError: the request is well-formed but has no physical solution (e.g. a current
 *   density at or above a limiting current). Also answered as HTTP 400, with the reason.
 * - ConvergenceError: an iterative solve did not converge; the result would not be
 *   trustworthy, so none is returned.
 */
export interface IssueDetail {
  /** Dotted path of the offending field, e.g. "anode.kinetics.exchangeCurrentDensity". */
  path: string;
  message: string;
}

export class InputError extends Error {
  readonly issues: IssueDetail[];
  constructor(path: string, message: string, readonly value?: unknown) {
    super(`${path}: ${message}`);
    this.name = 'InputError';
    this.issues = [{ path, message }];
  }
  static many(message: string, issues: IssueDetail[]): InputError {
    const err = new InputError(issues[0]?.path ?? '', issues[0]?.message ?? message);
    err.message = message;
    (err as { issues: IssueDetail[] }).issues = issues;
    return err;
  }
}

export class PhysicsError extends Error {
  readonly issues: IssueDetail[];
  constructor(path: string, message: string) {
    super(`${path}: ${message}`);
    this.name = 'PhysicsError';
    this.issues = [{ path, message }];
  }
}

export class ConvergenceError extends Error {
  constructor(message: string, readonly iterations?: number) {
    super(message);
    this.name = 'ConvergenceError';
  }
}
