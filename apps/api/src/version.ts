import { readFileSync } from 'node:fs';
import { execFileSync } from 'node:child_process';

function versionOf(relativePackageJson: string): string {
  try {
    const pkg = JSON.parse(readFileSync(new URL(relativePackageJson, import.meta.url), 'utf8')) as { version?: string };
    return pkg.version ?? '0.0.0';
  } catch {
    return '0.0.0';
  }
}

export const API_VERSION = versionOf('../package.json');

/**
 * What a run records as "solver version": the fe-core package version, plus the build (commit)
 * when the deployment sets PHASELOOP_BUILD, so a result can be traced to the exact code.
 */
export function solverVersion(env: NodeJS.ProcessEnv = process.env): string {
  const base = `fe-core ${versionOf('../../../packages/fe-core/package.json')}`;
  return env.PHASELOOP_BUILD ? `${base} (${env.PHASELOOP_BUILD})` : base;
}

let commit: string | undefined;

/** Git commit of the running code: PHASELOOP_BUILD when the deployment sets it, else the checkout's HEAD. */
export function solverCommit(env: NodeJS.ProcessEnv = process.env): string {
  if (env.PHASELOOP_BUILD) return env.PHASELOOP_BUILD;
  if (commit === undefined) {
    try {
      commit = execFileSync('git', ['rev-parse', 'HEAD'], { cwd: new URL('.', import.meta.url), encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'] }).trim();
    } catch {
      commit = 'unknown';
    }
  }
  return commit;
}
