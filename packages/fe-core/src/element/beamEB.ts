/**
 * beam2-eb: 2-node Euler–Bernoulli plane frame element (no shear deformation), fibre section.
 * Axial displacement linear, transverse displacement cubic Hermite, so the curvature
 * κ = w'' is linear along the element: with s = x/L,
 *   κ = [(12s − 6)/L²] w1 + [(6s − 4)/L] θ1 + [(6 − 12s)/L²] w2 + [(6s − 2)/L] θ2.
 * Exact nodal values for end-loaded elastic members.
 */
import { makeFrameKernel } from './frame';

export const beamEB = makeFrameKernel({
  name: 'beam2-eb',
  shear: false,
  rows(x, L, _phi, bk) {
    const s = x / L;
    bk[0] = 0;
    bk[1] = (12 * s - 6) / (L * L);
    bk[2] = (6 * s - 4) / L;
    bk[3] = 0;
    bk[4] = (6 - 12 * s) / (L * L);
    bk[5] = (6 * s - 2) / L;
  },
});
