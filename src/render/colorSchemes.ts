/**
 * Sequential colour schemes we allow for error maps: perceptually uniform (equal steps in value
 * look like equal steps in colour) and readable in greyscale. Rainbow-like schemes are left out
 * on purpose: they invent boundaries that are not in the data.
 * No imports here: the CLI lists these names in --help without loading vega.
 */
export const COLOR_SCHEMES = ['viridis', 'magma', 'inferno', 'plasma', 'cividis'] as const;
export type ColorScheme = (typeof COLOR_SCHEMES)[number];
export const DEFAULT_COLOR_SCHEME: ColorScheme = 'viridis';

export function isColorScheme(name: string): name is ColorScheme {
  return (COLOR_SCHEMES as readonly string[]).includes(name);
}
