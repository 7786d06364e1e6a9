/**
 * Material-point curves off the main thread: fe-core's uniaxial driver run at each requested
 * temperature (strain-controlled load to the peak and back), so the material page stays
 * responsive while parameters are edited. Message shapes: MaterialPointRequest/Answer in
 * workers/materialPoint.ts.
 *
 * Plain JavaScript on purpose: the web type check then does not walk into fe-core's material
 * models, whose own compiler settings differ from the web app's (unused-locals checks).
 */
import { createMaterial } from '@phaseloop/fe-core/material/index';
import { runMaterialPoint } from '@phaseloop/fe-core/material/materialPoint';

self.onmessage = (event) => {
  const { id, params, temperatures, peakStrain } = event.data;
  try {
    const curves = temperatures.map((temperature) => {
      const result = runMaterialPoint(createMaterial(params), {
        control: 'strain',
        path: [
          { value: 0, temperature },
          { value: peakStrain, temperature, increments: 80 },
          { value: 0, temperature, increments: 80 },
        ],
      });
      return { temperature, ok: result.ok, message: result.message, points: result.rows.map((r) => [100 * r.strain, r.stress, r.xi]) };
    });
    self.postMessage({ id, curves });
  } catch (error) {
    self.postMessage({ id, curves: [], error: error instanceof Error ? error.message : String(error) });
  }
};
