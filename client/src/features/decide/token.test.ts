import { describe, expect, it } from 'vitest';
import { tokenFromPath } from './token';

describe('tokenFromPath', () => {
  it('when the path is a decision link, then its token is read, with or without a trailing slash', () => {
    expect(tokenFromPath('/decide/AbC_12-xyz')).toBe('AbC_12-xyz');
    expect(tokenFromPath('/decide/AbC_12-xyz/')).toBe('AbC_12-xyz');
  });

  it('when the path is cut short, has more after the token or odd characters, then no token is read', () => {
    expect(tokenFromPath('/decide/')).toBe('');
    expect(tokenFromPath('/decide')).toBe('');
    expect(tokenFromPath('/decide/abc/extra')).toBe('');
    expect(tokenFromPath('/decide/abc%20def')).toBe('');
    expect(tokenFromPath('/jobs/abc')).toBe('');
  });
});
