/**
 * A generated structured quad mesh (nx × ny cells on a unit-aspect plate) with a smooth synthetic
 * displacement and scalar per frame, for measuring the results viewport at large element counts.
 */
import type { ViewportMesh } from '@/components/results/ResultsViewport.vue';

export function gridMesh(nx: number, ny: number): ViewportMesh {
  const coordinates = new Float32Array(2 * (nx + 1) * (ny + 1));
  for (let j = 0; j <= ny; j++) {
    for (let i = 0; i <= nx; i++) {
      const k = j * (nx + 1) + i;
      coordinates[2 * k] = (10 * i) / nx;
      coordinates[2 * k + 1] = (10 * j) / ny;
    }
  }
  const elements: ViewportMesh['elements'] = [];
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const a = j * (nx + 1) + i;
      elements.push({ type: 'q4', corners: [a, a + 1, a + nx + 2, a + nx + 1] });
    }
  }
  return { coordinates, elements };
}

/** Frame `t` ∈ [0, 1]: a bending-like displacement and a scalar that travels across the plate. */
export function gridFrame(mesh: ViewportMesh, t: number): { displacement: Float32Array; values: Float32Array } {
  const n = mesh.coordinates.length / 2;
  const displacement = new Float32Array(2 * n);
  const values = new Float32Array(n);
  for (let k = 0; k < n; k++) {
    const x = mesh.coordinates[2 * k]!;
    const y = mesh.coordinates[2 * k + 1]!;
    displacement[2 * k] = 0.02 * t * (y - 5);
    displacement[2 * k + 1] = 0.01 * t * x * x;
    values[k] = Math.sin(0.6 * x + 6 * t) * Math.cos(0.4 * y);
  }
  return { displacement, values };
}
