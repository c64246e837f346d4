/** Shows only the last four characters of an ID number, as receipts and seller-facing screens do. */
export function maskIdNumber(idNumber: string): string {
  const visible = idNumber.slice(-4);
  return `${'•'.repeat(Math.max(0, idNumber.length - 4))}${visible}`;
}

/** Whole years between a date of birth and a day, both as YYYY-MM-DD. */
export function ageOn(dateOfBirth: string, onDay: string): number {
  const [by, bm, bd] = dateOfBirth.split('-').map(Number) as [number, number, number];
  const [y, m, d] = onDay.split('-').map(Number) as [number, number, number];
  let age = y - by;
  if (m < bm || (m === bm && d < bd)) age -= 1;
  return age;
}

export const ID_TYPE_LABELS: Record<string, string> = {
  'drivers-license': "Driver's license",
  'state-id': 'State or provincial ID card',
  passport: 'Passport',
  'national-id': 'National ID card',
  'residence-permit': 'Residence permit',
  'military-id': 'Military ID',
};
