import { describe, expect, it } from 'vitest';
import { lineChartSvg } from '../../src/io/plotSvg.js';
import { svgToPng } from '../../src/io/plotRender.js';

describe('lineChartSvg', () => {
  it('lineChartSvg draws labelled axes, the series legend and highlights, deterministically', async () => {
    const chart = {
      title: 'Demo chart',
      xTitle: 'threshold (absolute)',
      yTitle: 'energy',
      xLog: true,
      series: [
        { name: 'lowest energy E0', points: [1e-6, 1e-4, 1e-2, 1].map((x, i) => ({ x, y: -1 + 0.1 * i })) },
        { name: 'edge', points: [{ x: 1e-5, y: -1 }], unjoined: true },
      ],
      yDomain: [-1.2, -0.6] as [number, number],
      bands: [{ from: 1e-4, to: 1e-2, label: 'plateau' }],
      rules: [{ x: 1e-5, label: 'noise floor', dashed: true }],
      markers: [{ x: 1e-4, y: -0.9, label: 'chosen' }],
    };
    const svg = await lineChartSvg(chart);
    expect(svg.startsWith('<svg')).toBe(true);
    expect(svg.trimEnd().endsWith('</svg>')).toBe(true);
    for (const text of ['threshold (absolute)', 'energy', 'Demo chart', 'lowest energy E0', 'plateau', 'noise floor', 'chosen']) {
      expect(svg).toContain(`>${text}</text>`);
    }
    expect(await lineChartSvg(chart)).toBe(svg);
    const two = await lineChartSvg([chart, { ...chart, title: 'Second panel' }]);
    expect(two).toContain('>Second panel</text>');
  });

  it('svgToPng rasterises a chart to a PNG of the SVG size at 2×', async () => {
    const svg = await lineChartSvg({ xTitle: 'x', yTitle: 'y', series: [{ name: 's', points: [{ x: 0, y: 0 }, { x: 1, y: 1 }] }], width: 200, height: 100 });
    const png = svgToPng(svg);
    // PNG signature and IHDR width/height (PNG specification, ISO/IEC 15948 §5.2, §11.2.2).
    expect(Array.from(png.slice(0, 8))).toEqual([137, 80, 78, 71, 13, 10, 26, 10]);
    const view = new DataView(png.buffer, png.byteOffset, png.byteLength);
    const width = Number(/width="(\d+)"/.exec(svg)![1]);
    const height = Number(/height="(\d+)"/.exec(svg)![1]);
    expect(view.getUint32(16)).toBe(2 * width);
    expect(view.getUint32(20)).toBe(2 * height);
  });
});
