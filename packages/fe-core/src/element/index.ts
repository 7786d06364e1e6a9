/**
 * Element kernels by name. Assembly looks kernels up here; see element/types.ts for the contract.
 */
import type { ElementKernel, ElementName } from './types';

export * from './types';

/** Registry of the implemented kernels (filled as element files land). */
export const elementKernels: Partial<Record<ElementName, ElementKernel>> = {};

export function getElementKernel(name: ElementName): ElementKernel {
  const kernel = elementKernels[name];
  if (!kernel) throw new Error(`element type '${name}' is not available`);
  return kernel;
}
