/**
 * Material-point curves off the main thread: fe-core's uniaxial driver run for each parameter set
 * at each requested temperature (strain-controlled load to the peak and back), so material pages
 * stay responsive while parameters are edited or two versions are compared. Message shapes:
 * MaterialPointRequest/Answer in workers/materialPoint.ts.
 *
 * Plain JavaScript on purpose: the web type check then does not walk into fe-core's material
 * models, whose own compiler settings differ from the web app's (unused-locals checks).
 */
import { createMaterial } from '@phaseloop/fe-core/material/index';
import { runMaterialPoint } from '@phaseloop/fe-core/material/materialPoint';

function traceSet(params, temperatures, peakStrain) {
  return temperatures.map((temperature) => {
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
}

self.onmessage = (event) => {
  const { id, sets, temperatures, peakStrain } = event.data;
  // One set failing (e.g. impossible transformation temperatures) must not hide the other's curves.
  const answers = sets.map(({ key, params }) => {
    try {
      return { key, curves: traceSet(params, temperatures, peakStrain) };
    } catch (error) {
      return { key, curves: [], error: error instanceof Error ? error.message : String(error) };
    }
  });
  self.postMessage({ id, sets: answers });
};
