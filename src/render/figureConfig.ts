/** Fonts and sizes legible on a slide (labels ≥ 12 px at 1×). */
export const FIGURE_CONFIG = {
  font: 'DejaVu Sans',
  background: 'white',
  padding: 12,
  title: { fontSize: 18, subtitleFontSize: 13.5, anchor: 'start', subtitleColor: '#444', offset: 10 },
  axis: { labelFontSize: 12.5, titleFontSize: 13.5, titleFontWeight: 'normal', tickColor: '#888', domainColor: '#888' },
  legend: { labelFontSize: 12, titleFontSize: 13, titleFontWeight: 'normal' },
  header: { labelFontSize: 14 },
  view: { stroke: '#bbb' },
} as const;
