import { describe, expect, it } from 'vitest';
import { isSafeReturnPath, paths } from './paths.ts';

describe('return path after sign-in', () => {
  it.each(['/lab', '/lab/peer-report?period=2026-11', '/network/audit-log#latest'])(
    'accepts the app path %s',
    (value) => {
      expect(isSafeReturnPath(value)).toBe(true);
    },
  );

  it.each(['//elsewhere.example/x', '/\\elsewhere.example', 'https://elsewhere.example', 'lab', '', null])(
    'refuses %s',
    (value) => {
      expect(isSafeReturnPath(value)).toBe(false);
    },
  );

  it('when there is a page to return to, then the sign-in link carries it encoded', () => {
    expect(paths.auth.signIn.getHref('/lab/uploads?x=1')).toBe(
      '/sign-in?redirectTo=%2Flab%2Fuploads%3Fx%3D1',
    );
    expect(paths.auth.signIn.getHref('//elsewhere.example')).toBe('/sign-in');
  });
});
