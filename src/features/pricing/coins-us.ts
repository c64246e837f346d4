import type { CoinSpec } from './coin-spec';

/**
 * Coins of the United States Mint. Nobody here checked a published text for these figures, so every
 * source says "from memory"; test/reference/coins.reference.test.ts checks each fine content against
 * gross weight x fineness.
 */
const MINT = 'United States Mint';
const us = (s: Omit<CoinSpec, 'issuer'>): CoinSpec => Object.freeze({ issuer: MINT, ...s });

export const US_COINS: readonly CoinSpec[] = [
  // 90% silver subsidiary coin: these weights hold from 1873 (earlier dimes, quarters and halves are lighter).
  us({
    coinType: 'us-90-dime', label: 'US dime, 90% silver (1873-1964)', denomination: '10 cents', years: '1873-1964', metal: 'silver',
    grossWeightGrams: '2.50', fineness: '0.900', fineTroyOunces: '0.07234', fineFrom: 'issuer', category: 'coin',
    source: 'US Mint coin specifications: 2.50 g, 90% silver, 0.07234 ozt (from memory); weight from the Coinage Act of 1873 (from memory)',
    note: 'Dimes before 1873 weigh less: weigh them and price by weight.',
  }),
  us({
    coinType: 'us-90-quarter', label: 'US quarter dollar, 90% silver (1873-1964)', denomination: '25 cents', years: '1873-1964', metal: 'silver',
    grossWeightGrams: '6.25', fineness: '0.900', fineTroyOunces: '0.18084', fineFrom: 'issuer', category: 'coin',
    source: 'US Mint coin specifications: 6.25 g, 90% silver, 0.18084 ozt (from memory); weight from the Coinage Act of 1873 (from memory)',
    note: 'Quarters before 1873 weigh less: weigh them and price by weight.',
  }),
  us({
    coinType: 'us-90-half', label: 'US half dollar, 90% silver (1873-1964)', denomination: '50 cents', years: '1873-1964', metal: 'silver',
    grossWeightGrams: '12.50', fineness: '0.900', fineTroyOunces: '0.36169', fineFrom: 'issuer', category: 'coin',
    source: 'US Mint coin specifications: 12.50 g, 90% silver, 0.36169 ozt (from memory); weight from the Coinage Act of 1873 (from memory)',
    note: 'Halves before 1873 weigh less: weigh them and price by weight.',
  }),
  us({
    coinType: 'us-90-dollar', label: 'US silver dollar, 90% silver (1878-1935)', denomination: '1 dollar', years: '1878-1935', metal: 'silver',
    grossWeightGrams: '26.73', fineness: '0.900', fineTroyOunces: '0.7734', fineFrom: 'issuer', category: 'coin',
    source: 'US Mint coin specifications: 26.73 g, 90% silver, 0.7734 ozt (from memory)',
  }),
  us({
    coinType: 'us-40-half', label: 'US half dollar, 40% silver (1965-1970)', denomination: '50 cents', years: '1965-1970', metal: 'silver',
    grossWeightGrams: '11.50', fineness: '0.400', fineTroyOunces: '0.1479', fineFrom: 'issuer', category: 'coin',
    source: 'US Mint coin specifications: 11.50 g, 40% silver overall (silver-clad), 0.1479 ozt (from memory)',
  }),
  us({
    coinType: 'us-40-dollar', label: 'US dollar, 40% silver (1971-1976 collector issues)', denomination: '1 dollar', years: '1971-1976', metal: 'silver',
    grossWeightGrams: '24.59', fineness: '0.400', fineTroyOunces: '0.3161', fineFrom: 'issuer', category: 'coin',
    source: 'US Mint coin specifications: 24.59 g, 40% silver overall (silver-clad), 0.3161 ozt (from memory)',
    note: 'Only the collector pieces (mostly S mint mark) are silver; circulating dollars of these years are copper-nickel.',
  }),
  us({
    coinType: 'us-35-nickel', label: 'US five cents, 35% silver (mid-1942 to 1945)', denomination: '5 cents', years: 'mid-1942 to 1945', metal: 'silver',
    grossWeightGrams: '5.00', fineness: '0.350', fineTroyOunces: '0.05626', fineFrom: 'issuer', category: 'coin',
    source: 'US Mint coin specifications: 5.00 g, 35% silver, 0.05626 ozt (from memory)',
    note: 'Only the wartime pieces with a large mint mark above the dome are silver; five-cent pieces of early 1942 are copper-nickel.',
  }),
  us({
    coinType: 'us-999-dollar-reissue', label: 'US silver dollar re-issue, .999 silver (2021 onward)', denomination: '1 dollar', years: '2021 onward', metal: 'silver',
    grossWeightGrams: '26.73', fineness: '0.999', fineTroyOunces: '0.858', fineFrom: 'issuer', category: 'coin',
    source: 'US Mint specifications of the 2021 silver dollars: 26.73 g, .999 silver, 0.858 ozt (from memory)',
    note: 'Same weight as the 90% dollars of 1878-1935 but .999 silver: check the date.',
  }),

  // Gold coin before 1934: .900 fine from 1837. Weights in grains: 516, 258, 129 and 64.5 (480 grains = 1 ozt),
  // so the fine content is exact: $20 = 464.4 grains = 0.9675 ozt.
  us({
    coinType: 'us-gold-20-dollar', label: 'US $20 gold coin, 90% gold (1850-1933)', denomination: '20 dollars', years: '1850-1933', metal: 'gold',
    grossWeightGrams: '33.436', fineness: '0.900', fineTroyOunces: '0.9675', fineFrom: 'issuer', category: 'coin',
    source: 'US Mint coin specifications: 33.436 g (516 grains), .900 gold, 0.9675 ozt; standard of the Coinage Act of 1837 (from memory)',
  }),
  us({
    coinType: 'us-gold-10-dollar', label: 'US $10 gold coin, 90% gold (1838-1933)', denomination: '10 dollars', years: '1838-1933', metal: 'gold',
    grossWeightGrams: '16.718', fineness: '0.900', fineTroyOunces: '0.48375', fineFrom: 'issuer', category: 'coin',
    source: 'US Mint coin specifications: 16.718 g (258 grains), .900 gold, 0.48375 ozt; standard of the Coinage Act of 1837 (from memory)',
  }),
  us({
    coinType: 'us-gold-5-dollar', label: 'US $5 gold coin, 90% gold (1839-1929)', denomination: '5 dollars', years: '1839-1929', metal: 'gold',
    grossWeightGrams: '8.359', fineness: '0.900', fineTroyOunces: '0.241875', fineFrom: 'issuer', category: 'coin',
    source: 'US Mint coin specifications: 8.359 g (129 grains), .900 gold, 0.241875 ozt; standard of the Coinage Act of 1837 (from memory)',
  }),
  us({
    coinType: 'us-gold-2-50-dollar', label: 'US $2.50 gold coin, 90% gold (1840-1929)', denomination: '2.50 dollars', years: '1840-1929', metal: 'gold',
    grossWeightGrams: '4.18', fineness: '0.900', fineTroyOunces: '0.1209375', fineFrom: 'issuer', category: 'coin',
    source: 'US Mint coin specifications: 4.18 g (64.5 grains), .900 gold, 0.1209375 ozt; standard of the Coinage Act of 1837 (from memory)',
  }),

  // Bullion coins.
  us({
    coinType: 'us-1oz-silver-bullion', label: 'US 1 oz silver bullion coin, .999 silver (1986 onward)', denomination: '1 dollar', years: '1986 onward', metal: 'silver',
    grossWeightGrams: '31.103', fineness: '0.999', fineTroyOunces: '0.999', fineFrom: 'computed', category: 'bullion',
    source: '31 U.S.C. 5112(e): weighs 31.103 g and contains .999 fine silver (from memory); fine content = gross x fineness',
    note: 'Sold as "1 troy oz"; 31.103 g at .999 holds 0.999 ozt of silver.',
  }),
  us({
    coinType: 'us-1oz-gold-bullion', label: 'US 1 oz gold bullion coin, 22 karat (1986 onward)', denomination: '50 dollars', years: '1986 onward', metal: 'gold',
    grossWeightGrams: '33.931', fineness: '0.9167', fineTroyOunces: '1', fineFrom: 'issuer', category: 'bullion',
    source: '31 U.S.C. 5112(a)(7): weighs 33.931 g and contains one troy ounce of fine gold; 22 karat (from memory)',
  }),
  us({
    coinType: 'us-half-oz-gold-bullion', label: 'US 1/2 oz gold bullion coin, 22 karat (1986 onward)', denomination: '25 dollars', years: '1986 onward', metal: 'gold',
    grossWeightGrams: '16.966', fineness: '0.9167', fineTroyOunces: '0.5', fineFrom: 'issuer', category: 'bullion',
    source: '31 U.S.C. 5112(a)(8): weighs 16.966 g and contains one-half troy ounce of fine gold (from memory)',
  }),
  us({
    coinType: 'us-quarter-oz-gold-bullion', label: 'US 1/4 oz gold bullion coin, 22 karat (1986 onward)', denomination: '10 dollars', years: '1986 onward', metal: 'gold',
    grossWeightGrams: '8.483', fineness: '0.9167', fineTroyOunces: '0.25', fineFrom: 'issuer', category: 'bullion',
    source: '31 U.S.C. 5112(a)(9): weighs 8.483 g and contains one-fourth troy ounce of fine gold (from memory)',
  }),
  us({
    coinType: 'us-tenth-oz-gold-bullion', label: 'US 1/10 oz gold bullion coin, 22 karat (1986 onward)', denomination: '5 dollars', years: '1986 onward', metal: 'gold',
    grossWeightGrams: '3.393', fineness: '0.9167', fineTroyOunces: '0.1', fineFrom: 'issuer', category: 'bullion',
    source: '31 U.S.C. 5112(a)(10): weighs 3.393 g and contains one-tenth troy ounce of fine gold (from memory)',
  }),
  us({
    coinType: 'us-1oz-gold-bullion-9999', label: 'US 1 oz gold bullion coin, .9999 gold (2006 onward)', denomination: '50 dollars', years: '2006 onward', metal: 'gold',
    grossWeightGrams: '31.108', fineness: '0.9999', fineTroyOunces: '1', fineFrom: 'issuer', category: 'bullion',
    source: '31 U.S.C. 5112(q): 1 troy ounce of .9999 fine gold; US Mint specifications: 31.108 g (from memory)',
  }),
  us({
    coinType: 'us-1oz-platinum-bullion', label: 'US 1 oz platinum bullion coin, .9995 platinum (1997 onward)', denomination: '100 dollars', years: '1997 onward', metal: 'platinum',
    grossWeightGrams: '31.120', fineness: '0.9995', fineTroyOunces: '1', fineFrom: 'issuer', category: 'bullion',
    source: 'US Mint platinum bullion coin specifications: 31.120 g, .9995 platinum, 1 troy oz (from memory); 31 U.S.C. 5112(k)',
  }),
  us({
    coinType: 'us-1oz-palladium-bullion', label: 'US 1 oz palladium bullion coin, .9995 palladium (2017 onward)', denomination: '25 dollars', years: '2017 onward', metal: 'palladium',
    grossWeightGrams: '31.120', fineness: '0.9995', fineTroyOunces: '1', fineFrom: 'issuer', category: 'bullion',
    source: 'US Mint palladium bullion coin specifications: 31.120 g, .9995 palladium, 1 troy oz (from memory)',
  }),
];
