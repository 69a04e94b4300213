import { describe, expect, it } from 'vitest';
import { energyPlot } from '../../../src/analysis/plots/energyPlot.js';
import { errorPlot } from '../../../src/analysis/plots/errorPlot.js';
import { zProfilePlot } from '../../../src/analysis/plots/zProfilePlot.js';
import { renderSvg, svgToPng } from '../../../src/io/plotRender.js';

describe('energyPlot', () => {
  it('energyPlot renders through vega to an SVG with labelled axes and every series, and resvg to a PNG', async () => {
    const svg = await renderSvg(
      energyPlot({ title: 'E vs D', dimension: [10, 100, 1000], energy: [-1, -1.5, -1.7], energyPt2: [-1.6, -1.75, -1.79], extrapolation: { energy: -1.8, uncertainty: 0.02, against: 'variance' }, reference: -1.81 }),
    );
    expect(svg.startsWith('<svg')).toBe(true);
    for (const label of ['subspace dimension (configurations)', 'energy', 'variational E0', 'E0 + PT2', 'extrapolated (vs variance)', 'reference']) expect(svg).toContain(label);
    const png = svgToPng(svg);
    // PNG signature (ISO/IEC 15948: 89 50 4E 47 0D 0A 1A 0A).
    expect(Array.from(png.subarray(0, 8))).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    // Same input, same SVG: outputs are deterministic and diffable.
    const again = await renderSvg(energyPlot({ title: 'E vs D', dimension: [10, 100, 1000], energy: [-1, -1.5, -1.7], energyPt2: [-1.6, -1.75, -1.79], extrapolation: { energy: -1.8, uncertainty: 0.02, against: 'variance' }, reference: -1.81 }));
    expect(again).toBe(svg);
  });

  it('errorPlot uses a log scale and leaves out values that cannot sit on it; zProfilePlot labels qubits', async () => {
    const spec = errorPlot({ title: 'err', dimension: [10, 20], energy: [-1, -1.2], variance: [0.5, 0], pt2: [-0.1, -0.01] }) as { encoding: { y: { scale: { type: string } } }; data: { values: unknown[] } };
    expect(spec.encoding.y.scale.type).toBe('log');
    expect(spec.data.values).toHaveLength(3); // variance 0 dropped
    const svg = await renderSvg(zProfilePlot('Z', [0.5, -0.5, 1]));
    expect(svg).toContain('qubit');
    expect(svg).toContain('⟨Z⟩');
  });
});
