export const METALS = ['gold', 'silver', 'platinum', 'palladium'] as const;
export type Metal = (typeof METALS)[number];

export const METAL_SYMBOLS: Record<Metal, string> = {
  gold: 'AU',
  silver: 'AG',
  platinum: 'PT',
  palladium: 'PD',
};

export const METAL_LABELS: Record<Metal, string> = {
  gold: 'Gold',
  silver: 'Silver',
  platinum: 'Platinum',
  palladium: 'Palladium',
};

export function isMetal(value: unknown): value is Metal {
  return typeof value === 'string' && (METALS as readonly string[]).includes(value);
}
