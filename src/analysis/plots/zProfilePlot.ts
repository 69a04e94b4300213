import type { TopLevelSpec } from 'vega-lite';
import { plotFrame, plotNumber } from './plotConfig.js';

/** Bar chart of ⟨Z_q⟩ against qubit index q, on a fixed [−1, 1] axis. */
export function zProfilePlot(title: string, z: number[]): TopLevelSpec {
  return {
    ...plotFrame(title, Math.min(900, Math.max(520, 14 * z.length)), 260),
    data: { values: z.map((v, q) => ({ qubit: q, z: plotNumber(v) })) },
    mark: { type: 'bar', color: '#1f77b4' },
    encoding: {
      x: { field: 'qubit', type: 'ordinal', title: 'qubit', axis: { labelAngle: 0, labelOverlap: 'greedy' } },
      y: { field: 'z', type: 'quantitative', title: '⟨Z⟩', scale: { domain: [-1, 1] } },
    },
  } as TopLevelSpec;
}
