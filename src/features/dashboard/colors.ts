import type { JobStage } from '@shared/domain';

/**
 * Benchrelay's own chart colours. Every one is at least 4.5:1 against white (WCAG 2.2 1.4.3 and, for
 * the bars themselves, 1.4.11 non-text contrast at 3:1), so a label drawn in the colour stays readable
 * and no bar depends on a faint tint. Neighbouring stages differ in hue and lightness.
 */
export const STAGE_COLORS: Record<Exclude<JobStage, 'released'>, string> = {
  intake: '#54606e', //            slate
  assessed: '#8a5a00', //          ochre
  approved: '#2f6b2f', //          moss
  on_bench: '#1d5fa8', //          cobalt
  quality_check: '#7a3e9d', //     violet
  ready: '#0f6e68', //             verdigris
  waiting_for_parts: '#b42318', // brick
  in_transit: '#9a4a0c', //        rust
};

export const SERIES = {
  primary: '#1d6f63', // the app's accent
  secondary: '#5a6472', // neutral for capacity and reference series
  median: '#1d5fa8',
  p90: '#9a4a0c',
} as const;
