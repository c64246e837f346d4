-- Payout rates: the "18K and above" band was split into 18K-21K, 22K-23K and 24K. A store's saved rate
-- for it carries to each part that has no rate of its own, so no store's price changes by the split.
UPDATE "store_settings"
SET "value" = jsonb_build_object(
    'gold-jewelry-18k-to-21k', "value" -> 'gold-jewelry-18k-and-above',
    'gold-jewelry-22k-to-23k', "value" -> 'gold-jewelry-18k-and-above',
    'gold-jewelry-24k', "value" -> 'gold-jewelry-18k-and-above'
  ) || ("value" - 'gold-jewelry-18k-and-above')
WHERE "key" = 'pricing.rates' AND jsonb_typeof("value") = 'object' AND "value" ? 'gold-jewelry-18k-and-above';
--> statement-breakpoint
-- Paid-on finenesses: 800 and 833 are also gold finenesses and 990 also silver, platinum and palladium,
-- so their keys name the metal they always meant here (800 and 833 silver, 990 gold). A key already saved
-- under the new name wins.
UPDATE "store_settings"
SET "value" = jsonb_build_object('AG800', "value" -> '800') || ("value" - '800')
WHERE "key" = 'pricing.assumed_fineness' AND jsonb_typeof("value") = 'object' AND "value" ? '800';
--> statement-breakpoint
UPDATE "store_settings"
SET "value" = jsonb_build_object('AG833', "value" -> '833') || ("value" - '833')
WHERE "key" = 'pricing.assumed_fineness' AND jsonb_typeof("value") = 'object' AND "value" ? '833';
--> statement-breakpoint
UPDATE "store_settings"
SET "value" = jsonb_build_object('AU990', "value" -> '990') || ("value" - '990')
WHERE "key" = 'pricing.assumed_fineness' AND jsonb_typeof("value") = 'object' AND "value" ? '990';
