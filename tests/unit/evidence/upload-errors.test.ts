import { describe, expect, it } from 'vitest';
import { STORE_UNREACHABLE, uploadErrorMessage } from '@/lib/evidence/upload-errors';

describe('what the uploader is told when an upload fails', () => {
  it('turns the SDK’s transport failures into words about the file store', () => {
    expect(uploadErrorMessage({ code: 'INTERNAL_CLIENT_ERROR', message: 'Something went wrong. Please report this to UploadThing.' })).toBe(STORE_UNREACHABLE);
    expect(uploadErrorMessage({ code: 'UPLOAD_FAILED', message: 'XHR failed 503 Service Unavailable' })).toBe(STORE_UNREACHABLE);
    expect(uploadErrorMessage({ code: 'BAD_REQUEST', message: 'Failed to report event "upload" to UploadThing server' })).toBe(STORE_UNREACHABLE);
  });

  it('passes the route’s own refusals through as written', () => {
    const refusal = 'This case is decided and its record is sealed: no evidence can be added or withdrawn.';
    expect(uploadErrorMessage({ code: 'BAD_REQUEST', message: refusal })).toBe(refusal);
    expect(uploadErrorMessage({ code: 'NOT_FOUND', message: 'That case was not found.' })).toBe('That case was not found.');
  });

  it('explains the SDK’s own limit checks instead of naming its internals', () => {
    expect(uploadErrorMessage({ code: 'BAD_REQUEST', message: 'Invalid config: InvalidFileType' })).toMatch(/file type this kind of evidence does not take/);
  });
});
