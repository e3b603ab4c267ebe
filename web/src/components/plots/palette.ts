/**
 * Colours of our plots, drawn from the app's own palette (plugins/vuetify.ts): a sequential scale
 * from deep ink through sea green and sand to copper, one colour per scan when scans are overlaid,
 * and the two bound regions.
 */
export const SEQUENTIAL = ['#1d2b45', '#2c4a6b', '#2f7287', '#4f9a8f', '#9cc3a0', '#e6d6a6', '#e0a36a', '#b5652b', '#7a3a17'] as const;
export const SCAN_COLOURS = ['#2c4a6b', '#b5652b', '#2f7d4f', '#8a4f9e', '#a66a00', '#3b8fa8', '#b3261e', '#5c6b2e'] as const;
export const MISSING_COLOUR = '#9aa0a6';

export interface PlotInk {
  text: string;
  muted: string;
  axis: string;
  split: string;
  background: string;
  region68: { fill: string; stroke: string };
  region95: { fill: string; stroke: string };
}

export function plotInk(dark: boolean): PlotInk {
  return dark
    ? {
        text: '#e6e8eb', muted: '#a9b1bb', axis: '#6b7682', split: '#2c343d', background: '#1e242b',
        region68: { fill: 'rgba(108, 194, 143, 0.30)', stroke: '#6cc28f' },
        region95: { fill: 'rgba(108, 194, 143, 0.12)', stroke: '#9fd8b5' },
      }
    : {
        text: '#1f2933', muted: '#5b6670', axis: '#8a949e', split: '#e4e1d9', background: '#ffffff',
        region68: { fill: 'rgba(47, 125, 79, 0.28)', stroke: '#2f7d4f' },
        region95: { fill: 'rgba(47, 125, 79, 0.10)', stroke: '#5e9f78' },
      };
}

export const scanColour = (i: number): string => SCAN_COLOURS[i % SCAN_COLOURS.length]!;
