// Tank volumes worked out by hand from the solids' formulas, independent of shared/calibration, so
// tests can check the engine and what is built on it (the gauge strip) against outside values.
// Formulas from CRC Standard Mathematical Tables and Formulae, 31st edition (D. Zwillinger, ed.), the
// sections on the circle and on solids — recalled from memory, section and page numbers not re-checked:
//   cylinder V = π r² h; cone V = π r² h / 3; frustum of a cone V = π h (R² + R r + r²) / 3;
//   spherical cap V = π h² (3r − h) / 3; circular segment of depth h: r² acos((r − h)/r) − (r − h) √(2rh − h²).
// Two 2:1 ellipsoidal heads together are a sphere of the shell's radius squashed to half along the
// tank's axis, so they hold half of that sphere's cap at every level (hand derivation, Cavalieri's principle).
// The sphere's cubic is solved by the trigonometric (Viète) method and the horizontal tank by bisection;
// each inverse is a hand derivation from the formula beside it.

const MM3_PER_L = 1e6;

/** A tank's volume formula and its hand inverse: litres held at a level, the level (mm) that holds some litres. */
export interface HandTank {
  capacityL: number;
  levelMm: (volumeL: number) => number;
}

/** Upright cylinder: V = π r² h, so h = V / (π r²). */
export function uprightCylinder(diameterMm: number, heightMm: number): HandTank {
  const areaMm2 = Math.PI * (diameterMm / 2) ** 2;
  return { capacityL: (areaMm2 * heightMm) / MM3_PER_L, levelMm: (v) => (v * MM3_PER_L) / areaMm2 };
}

/** Box: V = l · w · h. */
export function box(lengthMm: number, widthMm: number, heightMm: number): HandTank {
  return { capacityL: (lengthMm * widthMm * heightMm) / MM3_PER_L, levelMm: (v) => (v * MM3_PER_L) / (lengthMm * widthMm) };
}

/** Cylinder on a downward cone, level from the apex: r(h) = R h / Hc inside the cone, so V = π R² h³ / (3 Hc²). */
export function coneBottom(diameterMm: number, straightMm: number, coneMm: number): HandTank {
  const areaMm2 = Math.PI * (diameterMm / 2) ** 2;
  const coneMm3 = (areaMm2 * coneMm) / 3;
  return {
    capacityL: (coneMm3 + areaMm2 * straightMm) / MM3_PER_L,
    levelMm: (v) => {
      const mm3 = v * MM3_PER_L;
      return mm3 <= coneMm3 ? Math.cbrt((3 * mm3 * coneMm ** 2) / areaMm2) : coneMm + (mm3 - coneMm3) / areaMm2;
    },
  };
}

/** Frustum, radius r(h) = r₀ + k h: V = π (r(h)³ − r₀³) / (3k), so r(h) = ∛(r₀³ + 3kV/π). */
export function frustum(bottomDiameterMm: number, topDiameterMm: number, heightMm: number): HandTank {
  const r0 = bottomDiameterMm / 2;
  const k = (topDiameterMm / 2 - r0) / heightMm;
  const rAt = (mm3: number) => Math.cbrt(r0 ** 3 + (3 * k * mm3) / Math.PI);
  const r1 = topDiameterMm / 2;
  return { capacityL: (Math.PI * heightMm * (r0 * r0 + r0 * r1 + r1 * r1)) / 3 / MM3_PER_L, levelMm: (v) => (rAt(v * MM3_PER_L) - r0) / k };
}

/** Sphere: with x = h/r − 1 the cap formula becomes x³ − 3x + q = 0, q = 3V/(π r³) − 2; Viète's root in [−1, 1]. */
export function sphere(diameterMm: number): HandTank {
  const r = diameterMm / 2;
  return {
    capacityL: ((4 / 3) * Math.PI * r ** 3) / MM3_PER_L,
    levelMm: (v) => {
      const q = (3 * v * MM3_PER_L) / (Math.PI * r ** 3) - 2;
      const x = 2 * Math.cos(Math.acos(Math.max(-1, Math.min(1, -q / 2))) / 3 - (2 * Math.PI) / 3);
      return r * (1 + x);
    },
  };
}

/** Area in mm² of the circular segment of depth h in a circle of radius r: r² acos((r − h)/r) − (r − h) √(2rh − h²). */
export function circularSegmentMm2(r: number, h: number): number {
  return r * r * Math.acos((r - h) / r) - (r - h) * Math.sqrt(Math.max(0, 2 * r * h - h * h));
}

/** Horizontal cylinder with 2:1 heads: V(h) = L · segment(h) + ½ π h² (3r − h) / 3, inverted by bisection. */
export function horizontalWithHalfHeads(diameterMm: number, lengthMm: number): HandTank {
  const r = diameterMm / 2;
  const volumeL = (h: number) => (lengthMm * circularSegmentMm2(r, h) + (Math.PI * h * h * (3 * r - h)) / 6) / MM3_PER_L;
  return {
    capacityL: volumeL(diameterMm),
    levelMm: (v) => {
      let lo = 0;
      let hi = diameterMm;
      for (let i = 0; i < 200 && hi - lo > 1e-10; i++) {
        const mid = (lo + hi) / 2;
        if (volumeL(mid) < v) lo = mid;
        else hi = mid;
      }
      return (lo + hi) / 2;
    },
  };
}
