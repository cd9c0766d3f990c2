import { HttpErrorResponse } from '@angular/common/http';
import type { Problem } from '@clearbase/contracts';

/** What a screen shows for a failed request: one sentence, and messages per form field. */
export interface ProblemMessage {
  status: number;
  message: string;
  fieldErrors: Readonly<Record<string, string>>;
}

function isProblem(body: unknown): body is Problem {
  return typeof body === 'object' && body !== null && typeof (body as { title?: unknown }).title === 'string';
}

/**
 * Reads an RFC 9457 problem document from a failed HTTP call. Uses `detail`, else `title`; per-field
 * errors are keyed by their path (`email`, `password`, …). Anything else becomes a plain sentence.
 */
export function readProblem(error: unknown): ProblemMessage {
  if (!(error instanceof HttpErrorResponse)) {
    return {
      status: 0,
      message: 'Something went wrong in the app. Reload the page and try again.',
      fieldErrors: {},
    };
  }
  if (error.status === 0) {
    return {
      status: 0,
      message: 'The server cannot be reached. Check the connection and try again.',
      fieldErrors: {},
    };
  }
  let body: unknown = error.error;
  if (typeof body === 'string') {
    try {
      body = JSON.parse(body);
    } catch {
      // Not JSON: fall through to the status text.
    }
  }
  if (isProblem(body)) {
    const fieldErrors: Record<string, string> = {};
    for (const e of body.errors ?? []) {
      if (!(e.path in fieldErrors)) fieldErrors[e.path] = e.message;
    }
    return { status: error.status, message: body.detail ?? body.title, fieldErrors };
  }
  return {
    status: error.status,
    message: `The server answered ${error.status}${error.statusText ? ` ${error.statusText}` : ''}. Try again.`,
    fieldErrors: {},
  };
}
