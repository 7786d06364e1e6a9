/**
 * Element kernels by name. Assembly looks kernels up here; see element/types.ts for the contract.
 */
import { bar2 } from './bar2';
import { beamEB } from './beamEB';
import { beamTimoshenko } from './beamTimoshenko';
import { q4 } from './q4';
import { q4BBar } from './q4BBar';
import { q4Eas } from './q4Eas';
import { q8 } from './q8';
import { t3 } from './t3';
import { t6 } from './t6';
import type { ElementKernel, ElementName } from './types';

export * from './types';
export { fibreLayout, type FibreLayout } from './beamSection';

export const elementKernels: Readonly<Record<ElementName, ElementKernel>> = {
  bar2,
  'beam2-eb': beamEB,
  'beam2-timo': beamTimoshenko,
  t3,
  q4,
  'q4-eas': q4Eas,
  'q4-bbar': q4BBar,
  t6,
  q8,
};

export function getElementKernel(name: ElementName): ElementKernel {
  const kernel = elementKernels[name];
  if (!kernel) throw new Error(`element type '${name}' is not available`);
  return kernel;
}
