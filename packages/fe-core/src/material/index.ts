/**
 * Materials by model name: `createMaterial(params)` turns a validated parameter set
 * (packages/shared/src/materials.ts) into the Material implementation fe-core integrates.
 * A model whose implementation has not landed yet is reported in words, so a study that names
 * it fails before any solving starts.
 */
import type { MaterialParams } from '@phaseloop/shared';
import { createLinearElastic } from './elastic';
import { createJ2Plastic } from './j2';
import { createLagoudas2012 } from './lagoudas2012';
import { createSouzaAuricchio } from './souzaAuricchio';
import type { Material } from './types';

export * from './types';

type Factory = (params: MaterialParams) => Material<unknown>;

/** One line per model; the SMA models are added here when their files land. */
const FACTORIES: Partial<Record<MaterialParams['model'], Factory>> = {
  'linear-elastic': (p) => createLinearElastic(p as Extract<MaterialParams, { model: 'linear-elastic' }>) as Material<unknown>,
  'j2-plastic': (p) => createJ2Plastic(p as Extract<MaterialParams, { model: 'j2-plastic' }>) as Material<unknown>,
  lagoudas2012: (p) => createLagoudas2012(p as Extract<MaterialParams, { model: 'lagoudas2012' }>) as Material<unknown>,
  'souza-auricchio': (p) => createSouzaAuricchio(p as Extract<MaterialParams, { model: 'souza-auricchio' }>) as Material<unknown>,
};

export class MaterialNotAvailableError extends Error {
  constructor(readonly model: string) {
    super(`material model "${model}" is not yet available in this solver version`);
    this.name = 'MaterialNotAvailableError';
  }
}

export function isMaterialAvailable(model: string): boolean {
  return model in FACTORIES;
}

export function createMaterial(params: MaterialParams): Material<unknown> {
  const factory = FACTORIES[params.model];
  if (!factory) throw new MaterialNotAvailableError(params.model);
  return factory(params);
}
