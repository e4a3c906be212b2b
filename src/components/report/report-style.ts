/**
 * How the report and the replay draw a drive over the console's site map: the true path solid,
 * the believed (odometry) path dash-dotted (the route is plain grey dashes), each with its own colour too, so neither relies on colour.
 */
import { INK } from '@/drive/map-style';

export const REPORT_INK = {
  truth: '#b83a0b',
  truthFill: 'rgba(184, 58, 11, 0.55)',
  believed: INK.trail,
  /** Dash and dot, unlike the route's plain grey dashes. */
  believedDash: [12, 4, 2.5, 4],
  cloud: INK.cloud,
  ring: INK.ring,
  pin: INK.pin,
  pinFill: INK.pinFill,
  contact: '#a11212',
  halo: 'rgba(255, 255, 255, 0.9)',
  badge: '#1a2322',
} as const;

/** Opacity of the calls that are not highlighted. */
export const FADED = 0.28;
