import type { CoinSpec } from './coin-spec';

/**
 * Coins of other issuers that walk into US counters. Nobody here checked a published text for these
 * figures, so every source says "from memory". Where the issuer's gross weight and fineness give a fine
 * content other than the nominal one, the line is priced on gross x fineness (`fineFrom: 'computed'`).
 */
type Row = Omit<CoinSpec, 'issuer'>;
const by = (issuer: string) => (s: Row): CoinSpec => Object.freeze({ issuer, ...s });

const rcm = by('Royal Canadian Mint');
const royal = by('The Royal Mint (UK)');
const sa = by('South African Mint');
const austria = by('Austrian Mint');
const mexico = by('Banco de México');

const RCM = 'Royal Canadian Mint bullion specifications';
const AUSTRIA = 'Austrian Mint bullion specifications';
const SA = 'South African Mint bullion specifications';

export const WORLD_COINS: readonly CoinSpec[] = [
  rcm({
    coinType: 'ca-1oz-silver-bullion', label: 'Canada 1 oz silver bullion coin, .9999 silver (1988 onward)', denomination: '5 dollars', years: '1988 onward', metal: 'silver',
    grossWeightGrams: '31.11', fineness: '0.9999', fineTroyOunces: '1', fineFrom: 'issuer', category: 'bullion',
    source: `${RCM}: 31.11 g, .9999 silver, 1 troy oz (from memory)`,
  }),
  rcm({
    coinType: 'ca-1oz-gold-bullion', label: 'Canada 1 oz gold bullion coin, .9999 gold (1982 onward)', denomination: '50 dollars', years: '1982 onward', metal: 'gold',
    grossWeightGrams: '31.11', fineness: '0.9999', fineTroyOunces: '1', fineFrom: 'issuer', category: 'bullion',
    source: `${RCM}: 31.11 g, .9999 gold, 1 troy oz (from memory)`,
  }),
  rcm({
    coinType: 'ca-half-oz-gold-bullion', label: 'Canada 1/2 oz gold bullion coin, .9999 gold (1986 onward)', denomination: '20 dollars', years: '1986 onward', metal: 'gold',
    grossWeightGrams: '15.55', fineness: '0.9999', fineTroyOunces: '0.5', fineFrom: 'issuer', category: 'bullion',
    source: `${RCM}: 15.55 g, .9999 gold, 1/2 troy oz (from memory)`,
  }),
  rcm({
    coinType: 'ca-quarter-oz-gold-bullion', label: 'Canada 1/4 oz gold bullion coin, .9999 gold (1982 onward)', denomination: '10 dollars', years: '1982 onward', metal: 'gold',
    grossWeightGrams: '7.797', fineness: '0.9999', fineTroyOunces: '0.2507', fineFrom: 'computed', category: 'bullion',
    source: `${RCM}: 7.797 g, .9999 gold (from memory); fine content = gross x fineness`,
  }),
  rcm({
    coinType: 'ca-tenth-oz-gold-bullion', label: 'Canada 1/10 oz gold bullion coin, .9999 gold (1982 onward)', denomination: '5 dollars', years: '1982 onward', metal: 'gold',
    grossWeightGrams: '3.131', fineness: '0.9999', fineTroyOunces: '0.1007', fineFrom: 'computed', category: 'bullion',
    source: `${RCM}: 3.131 g, .9999 gold (from memory); fine content = gross x fineness`,
  }),
  rcm({
    coinType: 'ca-1oz-platinum-bullion', label: 'Canada 1 oz platinum bullion coin, .9995 platinum (1988 onward)', denomination: '50 dollars', years: '1988 onward', metal: 'platinum',
    grossWeightGrams: '31.11', fineness: '0.9995', fineTroyOunces: '0.9997', fineFrom: 'computed', category: 'bullion',
    source: `${RCM}: 31.11 g, .9995 platinum (from memory); fine content = gross x fineness`,
  }),
  rcm({
    coinType: 'ca-1oz-palladium-bullion', label: 'Canada 1 oz palladium bullion coin, .9995 palladium (2005 onward)', denomination: '50 dollars', years: '2005 onward', metal: 'palladium',
    grossWeightGrams: '31.11', fineness: '0.9995', fineTroyOunces: '0.9997', fineFrom: 'computed', category: 'bullion',
    source: `${RCM}: 31.11 g, .9995 palladium (from memory); fine content = gross x fineness`,
  }),

  royal({
    coinType: 'uk-sovereign', label: 'British sovereign, 22 carat gold (1817 onward)', denomination: '1 pound', years: '1817 onward', metal: 'gold',
    grossWeightGrams: '7.98805', fineness: '0.9167', fineTroyOunces: '0.2354', fineFrom: 'issuer', category: 'coin',
    source: 'Coinage Act 1971 (UK), Schedule 1: 7.98805 g of 22 carat (916.66) gold; The Royal Mint: 0.2354 ozt fine (from memory)',
  }),
  royal({
    coinType: 'uk-half-sovereign', label: 'British half sovereign, 22 carat gold (1817 onward)', denomination: '10 shillings (50 pence)', years: '1817 onward', metal: 'gold',
    grossWeightGrams: '3.99403', fineness: '0.9167', fineTroyOunces: '0.1177', fineFrom: 'issuer', category: 'coin',
    source: 'Coinage Act 1971 (UK), Schedule 1: 3.99403 g of 22 carat (916.66) gold; The Royal Mint: 0.1177 ozt fine (from memory)',
  }),
  royal({
    coinType: 'uk-1oz-gold-bullion-22k', label: 'UK 1 oz gold bullion coin, 22 carat (1987-2012)', denomination: '100 pounds', years: '1987-2012', metal: 'gold',
    grossWeightGrams: '34.05', fineness: '0.9167', fineTroyOunces: '1.0035', fineFrom: 'computed', category: 'bullion',
    source: 'The Royal Mint bullion specifications: 34.05 g, 22 carat, 31.21 g fine (from memory); fine content = gross x fineness',
  }),
  royal({
    coinType: 'uk-1oz-gold-bullion-9999', label: 'UK 1 oz gold bullion coin, .9999 gold (2013 onward)', denomination: '100 pounds', years: '2013 onward', metal: 'gold',
    grossWeightGrams: '31.21', fineness: '0.9999', fineTroyOunces: '1.0033', fineFrom: 'computed', category: 'bullion',
    source: 'The Royal Mint bullion specifications: 31.21 g, .9999 gold (from memory); fine content = gross x fineness',
  }),
  royal({
    coinType: 'uk-1oz-silver-bullion', label: 'UK 1 oz silver bullion coin, .999 silver (2013 onward)', denomination: '2 pounds', years: '2013 onward', metal: 'silver',
    grossWeightGrams: '31.21', fineness: '0.999', fineTroyOunces: '1.0024', fineFrom: 'computed', category: 'bullion',
    source: 'The Royal Mint bullion specifications: 31.21 g, .999 silver (from memory); fine content = gross x fineness',
  }),

  sa({
    coinType: 'za-1oz-gold-bullion', label: 'South Africa 1 oz gold bullion coin, 22 karat (1967 onward)', denomination: 'no face value', years: '1967 onward', metal: 'gold',
    grossWeightGrams: '33.93', fineness: '0.9167', fineTroyOunces: '1', fineFrom: 'issuer', category: 'bullion',
    source: `${SA}: 33.93 g, .9167 gold, 1 troy oz (from memory)`,
  }),
  sa({
    coinType: 'za-half-oz-gold-bullion', label: 'South Africa 1/2 oz gold bullion coin, 22 karat (1980 onward)', denomination: 'no face value', years: '1980 onward', metal: 'gold',
    grossWeightGrams: '16.965', fineness: '0.9167', fineTroyOunces: '0.5', fineFrom: 'issuer', category: 'bullion',
    source: `${SA}: 16.965 g, .9167 gold, 1/2 troy oz (from memory)`,
  }),
  sa({
    coinType: 'za-quarter-oz-gold-bullion', label: 'South Africa 1/4 oz gold bullion coin, 22 karat (1980 onward)', denomination: 'no face value', years: '1980 onward', metal: 'gold',
    grossWeightGrams: '8.482', fineness: '0.9167', fineTroyOunces: '0.25', fineFrom: 'issuer', category: 'bullion',
    source: `${SA}: 8.482 g, .9167 gold, 1/4 troy oz (from memory)`,
  }),
  sa({
    coinType: 'za-tenth-oz-gold-bullion', label: 'South Africa 1/10 oz gold bullion coin, 22 karat (1980 onward)', denomination: 'no face value', years: '1980 onward', metal: 'gold',
    grossWeightGrams: '3.393', fineness: '0.9167', fineTroyOunces: '0.1', fineFrom: 'issuer', category: 'bullion',
    source: `${SA}: 3.393 g, .9167 gold, 1/10 troy oz (from memory)`,
  }),

  austria({
    coinType: 'at-1oz-gold-bullion', label: 'Austria 1 oz gold bullion coin, .9999 gold (1989 onward)', denomination: '100 euros (2000 schilling before 2002)', years: '1989 onward', metal: 'gold',
    grossWeightGrams: '31.103', fineness: '0.9999', fineTroyOunces: '0.9999', fineFrom: 'computed', category: 'bullion',
    source: `${AUSTRIA}: 31.103 g, .9999 gold (from memory); fine content = gross x fineness`,
  }),
  austria({
    coinType: 'at-half-oz-gold-bullion', label: 'Austria 1/2 oz gold bullion coin, .9999 gold (1989 onward)', denomination: '50 euros', years: '1989 onward', metal: 'gold',
    grossWeightGrams: '15.552', fineness: '0.9999', fineTroyOunces: '0.5000', fineFrom: 'computed', category: 'bullion',
    source: `${AUSTRIA}: 15.552 g, .9999 gold (from memory); fine content = gross x fineness`,
  }),
  austria({
    coinType: 'at-quarter-oz-gold-bullion', label: 'Austria 1/4 oz gold bullion coin, .9999 gold (1989 onward)', denomination: '25 euros', years: '1989 onward', metal: 'gold',
    grossWeightGrams: '7.776', fineness: '0.9999', fineTroyOunces: '0.2500', fineFrom: 'computed', category: 'bullion',
    source: `${AUSTRIA}: 7.776 g, .9999 gold (from memory); fine content = gross x fineness`,
  }),
  austria({
    coinType: 'at-tenth-oz-gold-bullion', label: 'Austria 1/10 oz gold bullion coin, .9999 gold (1991 onward)', denomination: '10 euros', years: '1991 onward', metal: 'gold',
    grossWeightGrams: '3.121', fineness: '0.9999', fineTroyOunces: '0.1003', fineFrom: 'computed', category: 'bullion',
    source: `${AUSTRIA}: 3.121 g, .9999 gold (from memory); fine content = gross x fineness`,
  }),
  austria({
    coinType: 'at-1oz-silver-bullion', label: 'Austria 1 oz silver bullion coin, .999 silver (2008 onward)', denomination: '1.50 euros', years: '2008 onward', metal: 'silver',
    grossWeightGrams: '31.103', fineness: '0.999', fineTroyOunces: '0.9990', fineFrom: 'computed', category: 'bullion',
    source: `${AUSTRIA}: 31.103 g, .999 silver (from memory); fine content = gross x fineness`,
  }),

  mexico({
    coinType: 'mx-50-pesos', label: 'Mexico 50 pesos, 90% gold (1921-1947 and restrikes)', denomination: '50 pesos', years: '1921-1947', metal: 'gold',
    grossWeightGrams: '41.666', fineness: '0.900', fineTroyOunces: '1.2057', fineFrom: 'issuer', category: 'coin',
    source: 'Banco de México specifications: 41.666 g, .900 gold, 37.5 g (1.2057 ozt) fine (from memory)',
    note: 'Restrikes carry the date 1947 and have the same gold content.',
  }),
];
