// Relative paths are the user's: npm's INIT_CWD when our own npm script runs the command.
import { describe, expect, it } from 'vitest';
import { isAbsolute, join } from 'node:path';
import { pathArg, userDir } from '../../bridge/cli/user-dir.ts';

describe('userDir', () => {
  const npm = { npm_package_name: 'echotrail', npm_lifecycle_event: 'echotrail' };
  it('is INIT_CWD under `npm run echotrail` (npm starts the script in the repository)', () => {
    expect(userDir({ ...npm, INIT_CWD: '/home/me/runs' }, '/work/main')).toBe('/home/me/runs');
    expect(userDir({ ...npm, npm_lifecycle_event: 'start', INIT_CWD: '/home/me' }, '/work/main')).toBe('/home/me');
  });
  it('is the working directory otherwise', () => {
    expect(userDir({}, '/home/me')).toBe('/home/me');
    // Another package's script that changed directory: its INIT_CWD is not where the user meant.
    expect(userDir({ INIT_CWD: '/elsewhere', npm_package_name: 'other', npm_lifecycle_event: 'build' }, '/home/me')).toBe('/home/me');
  });
});

describe('pathArg', () => {
  it('makes a path absolute and leaves - alone', () => {
    expect(pathArg('-')).toBe('-');
    expect(pathArg('a/b.csv')).toBe(join(process.cwd(), 'a/b.csv'));
    expect(isAbsolute(pathArg('x'))).toBe(true);
  });
});
