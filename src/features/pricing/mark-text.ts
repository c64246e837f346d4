/** How a typed or stamped mark is read into words: normalising, tokens and the vocabulary the parser knows. */

export const MAX_MARK_LENGTH = 200;

/** Upper case, decimal finenesses to digits ("0.925", ".925" -> "925"; "999.9" -> "9999"), tokens spaced. */
export function normaliseMark(input: string): string {
  let s = input.length > MAX_MARK_LENGTH ? input.slice(0, MAX_MARK_LENGTH) : input;
  s = s.normalize('NFKC').toUpperCase();
  s = s.replace(/[\u2044\u2215]/g, '/');
  s = s.replace(/(^|[^\d])0?[.,](\d{3,4})(?!\d)/g, '$1$2');
  s = s.replace(/(^|[^\d])(\d{3})[.,](\d)(?!\d)/g, '$1$2$3');
  s = s.replace(/([A-Z])\.(?=[A-Z])/g, '$1');
  s = s.replace(/(\d)(?=[A-Z])/g, '$1 ').replace(/([A-Z])(?=\d)/g, '$1 ');
  s = s.replace(/\s*\/\s*/g, '/');
  s = s.replace(/[^A-Z0-9/]+/g, ' ').trim();
  return s;
}

const KARAT_UNIT = '(?:KARATS?|CARATS?|KT|CT|KP|K)';
const COMPOSITE = new RegExp(`^(${KARAT_UNIT.slice(3, -1)})(GF|RGP|GP|GE|HGE|HGP|EP|GEP)$`);

/** Tokens of a normalised mark, with run-together forms split ("14KGF", "SILVERPLATE"). */
export function expandTokens(normalized: string): string[] {
  const out: string[] = [];
  for (const token of normalized.split(' ')) {
    const m = COMPOSITE.exec(token);
    if (m) out.push(m[1]!, m[2]!);
    else if (token === 'SILVERPLATE' || token === 'SILVERPLATED') out.push('SILVER', 'PLATED');
    else if (token === 'GOLDFILLED') out.push('GOLD', 'FILLED');
    else if (token === 'NICKELSILVER') out.push('NICKEL', 'SILVER');
    else if (token !== '') out.push(token);
  }
  return out;
}

export const NO_PRECIOUS = /\b(?:NICKEL SILVER|GERMAN SILVER|ALPAC+A|NEUSILBER|STAINLESS|TITANIUM|TUNGSTEN|BRASS)\b/;
export const FILLED = /\b(?:GF|RGP|GOLD FILLED|GOLD FILL|ROLLED GOLD(?: PLATED?)?)\b/;
export const PLATED_SILVER = /\b(?:EPNS|EPBM|EPWM|EPC|EP|SILVER PLATED?|(?:QUADRUPLE|QUAD|TRIPLE|DOUBLE) PLATED?|STERLING PLATED?)\b/;
export const PLATED_GOLD = /\b(?:HGE|HGP|GEP|GP|GE|GOLD PLATED?|GOLD ELECTROPLATED?|HEAVY GOLD ELECTROPLATE)\b/;
export const PLATED_ANY = /\b(?:PLATED?|ELECTROPLATED?)\b/;
export const FRACTION = /\b(\d{1,3})\/(\d{1,4})\b/;
export const KARAT_AFTER = new RegExp(`\\b(\\d{1,2}) ${KARAT_UNIT}\\b`, 'g');
export const KARAT_BEFORE = /\bK (\d{1,2})\b/g;
export const PLUMB = /\b\d{1,2} KP\b/;
export const PT_WORD = /\b(?:PT|PLAT|PLATINUM|PLATINA)\b/;
export const PD_WORD = /\b(?:PD|PALL|PALLADIUM)\b/;
export const STERLING_WORD = /\b(?:STERLING|STERL|STER|STG)\b/;
export const COIN_WORD = /\bCOIN\b/;
export const FINE_SILVER = /\bFINE SILVER\b/;
export const FINE_GOLD = /\bFINE GOLD\b/;
export const BRITANNIA_WORD = /\bBRITANNIA\b/;
export const VERMEIL_WORD = /\bVERMEIL\b/;
export const NUMBER_TOKEN = /^\d{3,4}$/;

export const SILVER_HINTS = new Set(['AG', 'S', 'SILVER', 'PLATA', 'ARGENTO', 'ARGENT']);
export const GOLD_HINTS = new Set(['AU', 'G', 'GOLD', 'ORO']);

export const VOCABULARY = new Set([
  'K', 'KT', 'CT', 'KP', 'KARAT', 'KARATS', 'CARAT', 'CARATS', 'GF', 'RGP', 'GP', 'GE', 'HGE', 'HGP', 'GEP', 'EP',
  'EPNS', 'EPBM', 'EPWM', 'EPC', 'FILLED', 'FILL', 'ROLLED', 'PLATE', 'PLATED', 'ELECTROPLATE', 'ELECTROPLATED',
  'HEAVY', 'QUADRUPLE', 'QUAD', 'TRIPLE', 'DOUBLE', 'PT', 'PLAT', 'PLATINUM', 'PLATINA', 'PD', 'PALL', 'PALLADIUM',
  'STERLING', 'STERL', 'STER', 'STG', 'COIN', 'FINE', 'BRITANNIA', 'VERMEIL', 'SOLID', 'PURE',
  ...SILVER_HINTS, ...GOLD_HINTS,
]);
