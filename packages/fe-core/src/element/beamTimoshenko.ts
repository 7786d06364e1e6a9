/**
 * beam2-timo: 2-node Timoshenko plane frame element with INTERDEPENDENT (linked) interpolation,
 * fibre section for the normal stress, elastic shear term κ_s G A γ.
 *
 * Locking remedy: the interpolation is the exact homogeneous solution of the elastic Timoshenko
 * equations (θ quadratic, w cubic, their coefficients linked through φ = 12EI/(κ_s G A L²)), so the
 * shear strain is constant and the curvature linear, and neither locks as L/h grows. With
 * Δ = w2 − w1 − (θ1 + θ2)L/2 and q(x) = −6(2x − L)/(L³(1 + φ)):
 *   κ(x) = (θ2 − θ1)/L + q(x) Δ,        γ = φ Δ / (L (1 + φ)).
 * φ → 0 recovers the Hermite (Euler–Bernoulli) curvature; φ → ∞ the constant-shear,
 * constant-curvature element. Nodal values are exact for end-loaded elastic members. φ uses the
 * initial elastic E and G; the shear stays elastic while the fibres may yield or transform.
 */
import { makeFrameKernel } from './frame';

export const beamTimoshenko = makeFrameKernel({
  name: 'beam2-timo',
  shear: true,
  rows(x, L, phi, bk, bg) {
    const q = (-6 * (2 * x - L)) / (L ** 3 * (1 + phi));
    bk[0] = 0;
    bk[1] = -q;
    bk[2] = -1 / L - (q * L) / 2;
    bk[3] = 0;
    bk[4] = q;
    bk[5] = 1 / L - (q * L) / 2;
    const r = phi / (L * (1 + phi));
    bg[0] = 0;
    bg[1] = -r;
    bg[2] = (-r * L) / 2;
    bg[3] = 0;
    bg[4] = r;
    bg[5] = (-r * L) / 2;
  },
});
