import { describe, expect, it } from 'vitest';
import { safeReturnTo, signInPath } from './return-to';

describe('return-to after sign-in', () => {
  it('keeps a page inside the app with its query', () => {
    expect(safeReturnTo('/jobs?state=in_work')).toBe('/jobs?state=in_work');
    expect(signInPath('/owners/1')).toBe('/sign-in?returnTo=%2Fowners%2F1');
  });

  it('refuses other sites and the sign-in pages themselves', () => {
    expect(safeReturnTo('//elsewhere.example/x')).toBeNull();
    expect(safeReturnTo('https://elsewhere.example')).toBeNull();
    expect(safeReturnTo('/sign-in')).toBeNull();
    expect(signInPath('/')).toBe('/sign-in');
  });
});
