// @vitest-environment happy-dom
import { describe, expect, test } from 'vitest';
import { clearDraft, readDraft, saveDraft } from '../../../../src/lib/form-drafts';
import { applyServerErrors } from '../../../../src/lib/form-errors';
import { ApiError } from '../../../../src/lib/api-client';

describe('form drafts', () => {
  test('when a draft is saved, then it reads back without any password, code or token field', () => {
    saveDraft('t1', { email: 'a@b.test', password: 'secret-1', newPassword: 'secret-2', nested: { inviteToken: 'x', note: 'keep' } });
    expect(readDraft('t1')).toEqual({ email: 'a@b.test', nested: { note: 'keep' } });
    expect(sessionStorage.getItem('crumbtrail:draft:t1')).not.toContain('secret');
  });
  test('when a draft is cleared, then nothing reads back', () => {
    saveDraft('t2', { name: 'x' });
    clearDraft('t2');
    expect(readDraft('t2')).toBeUndefined();
  });
});

describe('applyServerErrors', () => {
  test('when the server names fields, then each becomes that field error and no form message is set', () => {
    const calls: Array<[string, string | undefined]> = [];
    const message = applyServerErrors(new ApiError(400, 'validation_failed', 'Check the form.', { email: ['Enter an e-mail address'] }), (name, err) => calls.push([name, err.message]), ['email']);
    expect(calls).toEqual([['email', 'Enter an e-mail address']]);
    expect(message).toBeUndefined();
  });
  test('when the error belongs to no field, then it becomes the form-level message', () => {
    const calls: Array<[string, string | undefined]> = [];
    const message = applyServerErrors(new ApiError(409, 'conflict', 'You cannot demote the last active owner.'), (name, err) => calls.push([name, err.message]), ['role']);
    expect(calls).toEqual([['root.server', 'You cannot demote the last active owner.']]);
    expect(message).toBe('You cannot demote the last active owner.');
  });
});
