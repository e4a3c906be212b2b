/**
 * Turns the risk of a pass and the call made into a grade, by the rubric's two band edges
 * (Driftproof's own rubric; see README "Scoring").
 *
 * | risk of a normal pass | proceed | creep (by the creep's own risk) | reanchor (marker in view) | halt |
 * |---|---|---|---|---|
 * | low  | sound  | acceptable                         | over-cautious | over-cautious |
 * | mid  | risky  | low: sound, mid: risky, high: unsafe | sound       | acceptable if neither a marker nor a low-risk creep was on offer, else over-cautious |
 * | high | unsafe | low: acceptable, mid: risky, high: unsafe | sound    | sound if no marker was in view, else acceptable |
 * @module
 */
import type { Call, Rubric } from '../schemas/content';
import type { Grade, RiskBand } from './types';

export function riskBand(risk: number, [low, high]: Rubric['riskBands']): RiskBand {
  return risk < low ? 'low' : risk < high ? 'mid' : 'high';
}

export interface GradeInput {
  call: Call;
  riskProceed: number;
  riskCreep: number;
  markerInView: boolean;
  bands: Rubric['riskBands'];
}

export function gradeCall({ call, riskProceed, riskCreep, markerInView, bands }: GradeInput): Grade {
  const band = riskBand(riskProceed, bands);
  const creepBand = riskBand(riskCreep, bands);
  switch (call) {
    case 'proceed':
      return band === 'low' ? 'sound' : band === 'mid' ? 'risky' : 'unsafe';
    case 'creep':
      if (creepBand === 'mid') return 'risky';
      if (creepBand === 'high') return 'unsafe';
      return band === 'mid' ? 'sound' : 'acceptable';
    case 'reanchor':
      return band === 'low' ? 'overCautious' : 'sound';
    case 'halt':
      if (band === 'low') return 'overCautious';
      if (band === 'mid') return markerInView || creepBand === 'low' ? 'overCautious' : 'acceptable';
      return markerInView ? 'acceptable' : 'sound';
  }
}

/** Whether a risk lies within `margin` of either band edge. */
export const nearEdge = (risk: number, bands: Rubric['riskBands'], margin: number) => bands.some((edge) => Math.abs(risk - edge) < margin);
