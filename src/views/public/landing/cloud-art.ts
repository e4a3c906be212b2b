/**
 * The landing page's picture: a drift cloud after a straight run, drawn from a small seeded
 * sample of heading and distance errors (the crescent that odometry drift makes), with the 95 %
 * ring of its position covariance (chi-square, 2 dof: 5.991).
 */

/** mulberry32: a tiny seeded generator, so the picture is the same on every visit. */
function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function gaussian(random: () => number): number {
  const u = Math.max(random(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
}

export interface CloudArt {
  particles: { x: number; y: number }[];
  ring: { cx: number; cy: number; rx: number; ry: number; angle: number };
  end: { x: number; y: number };
}

/** Particles after `distance` units straight along +x from (0, 0), in those units. */
export function cloudArt(count = 260, distance = 175, seed = 7): CloudArt {
  const random = seeded(seed);
  const particles = Array.from({ length: count }, () => {
    const heading = gaussian(random) * 0.2;
    const along = distance * (1 + gaussian(random) * 0.03);
    return { x: along * Math.cos(heading), y: along * Math.sin(heading) };
  });
  const mx = particles.reduce((s, p) => s + p.x, 0) / count;
  const my = particles.reduce((s, p) => s + p.y, 0) / count;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (const p of particles) {
    sxx += (p.x - mx) ** 2;
    syy += (p.y - my) ** 2;
    sxy += (p.x - mx) * (p.y - my);
  }
  sxx /= count - 1;
  syy /= count - 1;
  sxy /= count - 1;
  // Eigenvalues of the 2×2 covariance give the ring's semi-axes.
  const mean = (sxx + syy) / 2;
  const spread = Math.sqrt(((sxx - syy) / 2) ** 2 + sxy ** 2);
  const k = 5.991;
  return {
    particles,
    ring: {
      cx: mx,
      cy: my,
      rx: Math.sqrt(k * (mean + spread)),
      ry: Math.sqrt(k * Math.max(mean - spread, 0)),
      angle: (Math.atan2(2 * sxy, sxx - syy) / 2) * (180 / Math.PI),
    },
    end: { x: distance, y: 0 },
  };
}
