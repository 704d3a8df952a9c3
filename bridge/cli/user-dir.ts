/**
 * Where relative paths on the command line start from. `npm run echotrail -- …` (and `npm
 * --prefix REPO run …`) runs the command in the repository, not where the user typed it; npm
 * keeps the user's directory in INIT_CWD. Only our own npm scripts are trusted to have set it: a
 * script of some other package that changes directory before calling the `echotrail` binary
 * inherits an INIT_CWD that is not where the user meant.
 */
import { resolve } from 'node:path';

/** Scripts of package.json that run the CLI. */
const OWN_SCRIPTS = new Set(['echotrail', 'start']);

/** The user's directory: INIT_CWD when one of our npm scripts runs us, else `cwd`. */
export function userDir(env: NodeJS.ProcessEnv = process.env, cwd = process.cwd()): string {
  const init = env.INIT_CWD;
  return init && env.npm_package_name === 'echotrail' && OWN_SCRIPTS.has(env.npm_lifecycle_event ?? '') ? resolve(init) : cwd;
}

/**
 * Commander argument parser for a file or folder option: the absolute path, so that every
 * message about it ("cannot read …") names the file the user can look for. '-' (stdin/stdout)
 * stays as it is.
 */
export function pathArg(value: string): string {
  return value === '-' ? value : resolve(value);
}
