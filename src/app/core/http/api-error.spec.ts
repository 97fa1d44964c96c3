import { HttpErrorResponse } from '@angular/common/http';
import { describe, expect, it } from 'vitest';
import { toApiFailure } from './api-error';

describe('toApiFailure', () => {
  const http = new HttpErrorResponse({
    status: 404,
    statusText: 'Not Found',
    error: { error: { code: 'song.not_found', message: 'No such song in this team.' } },
  });

  it('reads the API error shape out of an HTTP failure', () => {
    expect(toApiFailure(http)).toEqual({ status: 404, code: 'song.not_found', message: 'No such song in this team.', issues: [] });
  });

  it('reads a wrapped failure (a resource error) through its cause', () => {
    expect(toApiFailure(new Error('Resource failed', { cause: http }))).toEqual(toApiFailure(http));
  });

  it('gives a client failure for a plain error', () => {
    expect(toApiFailure(new Error('boom'))).toMatchObject({ status: -1, code: 'client', message: 'boom' });
  });
});
