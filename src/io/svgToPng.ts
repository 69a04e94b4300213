import { Resvg } from '@resvg/resvg-js';

/** Rasterise an SVG string to PNG bytes with resvg (system fonts, white background, 2× scale). */
export function svgToPng(svg: string): Uint8Array {
  const r = new Resvg(svg, { background: 'white', fitTo: { mode: 'zoom', value: 2 }, font: { loadSystemFonts: true, defaultFontFamily: 'DejaVu Sans' } });
  return r.render().asPng();
}
