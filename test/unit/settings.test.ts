import { describe, expect, it } from 'vitest';
import { defaultSettings, parseSettingValue, SETTING_DEFINITIONS, SettingValueError } from '@/features/settings/settings';
import { ageOn, maskIdNumber } from '@/features/sellers/sellers';

describe('store settings definitions', () => {
  it('has a default for every key that its own schema accepts', () => {
    const defaults = defaultSettings() as Record<string, unknown>;
    for (const [key, def] of Object.entries(SETTING_DEFINITIONS)) {
      expect(def.schema.safeParse(defaults[key]).success, key).toBe(true);
    }
  });

  it('names the key when a value is refused', () => {
    expect(() => parseSettingValue('seller.minimum_age_years', 12)).toThrow(SettingValueError);
    expect(() => parseSettingValue('seller.minimum_age_years', 12)).toThrow(/seller.minimum_age_years/);
    expect(() => parseSettingValue('cash.limit_per_ticket', '10,000')).toThrow(/cash.limit_per_ticket/);
    expect(parseSettingValue('cash.limit_per_ticket', '10000.00')).toBe('10000.00');
  });

  it('gives fresh default objects so one store cannot change another\u2019s', () => {
    const a = defaultSettings();
    a['seller.accepted_id_types'].push('national-id');
    expect(defaultSettings()['seller.accepted_id_types']).not.toContain('national-id');
  });
});

describe('seller helpers', () => {
  it('masks all but the last four characters of an ID number', () => {
    expect(maskIdNumber('D-4471-9920')).toBe('•••••••9920');
    expect(maskIdNumber('123')).toBe('123');
  });

  it('counts whole years of age, the day before and on the birthday', () => {
    expect(ageOn('2008-12-02', '2026-12-01')).toBe(17);
    expect(ageOn('2008-12-01', '2026-12-01')).toBe(18);
    expect(ageOn('2008-02-29', '2026-02-28')).toBe(17);
  });
});
