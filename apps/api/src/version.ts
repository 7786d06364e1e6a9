import { readFileSync } from 'node:fs';

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
