/** The fake's own payout-account setup page, reached through an account link. */

export const TEST_CARD_NUMBER = '4000056655665556';
export const TEST_ROUTING_NUMBER = '110000000';
export const TEST_ACCOUNT_NUMBER = '000123456789';
export const PAGE_TITLE = 'Test payout account setup (local test service)';

export type Method = 'card' | 'bank';

export interface OnboardingValues {
  method: Method;
  card_number: string;
  card_exp: string;
  card_name: string;
  routing_number: string;
  account_number: string;
  account_holder_name: string;
}

export type FieldErrors = Partial<Record<keyof OnboardingValues, string>>;

export type Submission =
  | { method: 'card'; number: string; exp_month: number; exp_year: number; name: string }
  | { method: 'bank'; routing_number: string; account_number: string; account_holder_name: string };

export function defaultValues(): OnboardingValues {
  return {
    method: 'card',
    card_number: TEST_CARD_NUMBER,
    card_exp: '12/34',
    card_name: 'Test Seller',
    routing_number: TEST_ROUTING_NUMBER,
    account_number: TEST_ACCOUNT_NUMBER,
    account_holder_name: 'Test Seller',
  };
}

function escapeHtml(text: string): string {
  return text
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;');
}

function luhnValid(digits: string): boolean {
  let sum = 0;
  for (let i = 0; i < digits.length; i++) {
    let d = Number(digits[digits.length - 1 - i]);
    if (i % 2 === 1) {
      d *= 2;
      if (d > 9) d -= 9;
    }
    sum += d;
  }
  return sum % 10 === 0;
}

export function valuesFromForm(form: URLSearchParams): OnboardingValues {
  const get = (name: keyof OnboardingValues) => (form.get(name) ?? '').trim();
  return {
    method: get('method') === 'bank' ? 'bank' : 'card',
    card_number: get('card_number'),
    card_exp: get('card_exp'),
    card_name: get('card_name'),
    routing_number: get('routing_number'),
    account_number: get('account_number'),
    account_holder_name: get('account_holder_name'),
  };
}

export function validate(values: OnboardingValues, now = new Date()): { errors: FieldErrors } | { submission: Submission } {
  const errors: FieldErrors = {};
  if (values.method === 'card') {
    const number = values.card_number.replace(/[\s-]/g, '');
    if (!/^\d{12,19}$/.test(number) || !luhnValid(number)) errors.card_number = 'Enter a valid card number, for example the test card 4000 0566 5566 5556.';
    const exp = /^(\d{1,2})\s*\/\s*(\d{2}|\d{4})$/.exec(values.card_exp);
    let expMonth = 0;
    let expYear = 0;
    if (exp) {
      expMonth = Number(exp[1]);
      expYear = Number(exp[2]);
      if (expYear < 100) expYear += 2000;
    }
    const thisMonth = now.getUTCFullYear() * 12 + now.getUTCMonth() + 1;
    if (!exp || expMonth < 1 || expMonth > 12) errors.card_exp = 'Enter the expiry as MM/YY, for example 12/34.';
    else if (expYear * 12 + expMonth < thisMonth) errors.card_exp = 'This card has expired; enter a date in the future.';
    if (!values.card_name) errors.card_name = 'Enter the name on the card.';
    if (Object.keys(errors).length) return { errors };
    return { submission: { method: 'card', number, exp_month: expMonth, exp_year: expYear, name: values.card_name } };
  }
  const routing = values.routing_number.replace(/\s/g, '');
  const account = values.account_number.replace(/\s/g, '');
  if (!/^\d{9}$/.test(routing)) errors.routing_number = 'Enter a 9-digit routing number, for example 110000000.';
  if (!/^\d{4,17}$/.test(account)) errors.account_number = 'Enter an account number of 4 to 17 digits, for example 000123456789.';
  if (!values.account_holder_name) errors.account_holder_name = 'Enter the account holder’s name.';
  if (Object.keys(errors).length) return { errors };
  return { submission: { method: 'bank', routing_number: routing, account_number: account, account_holder_name: values.account_holder_name } };
}

const FIELD_LABELS: Record<keyof OnboardingValues, string> = {
  method: 'Payout method',
  card_number: 'Card number',
  card_exp: 'Expiry date (MM/YY)',
  card_name: 'Name on card',
  routing_number: 'Routing number',
  account_number: 'Account number',
  account_holder_name: 'Account holder name',
};

const STYLE = `
  :root { color-scheme: light; font-family: system-ui, sans-serif; line-height: 1.5; color: #1a1a1a; background: #f6f6f4; }
  main { max-width: 36rem; margin: 2rem auto; padding: 1.5rem; background: #fff; border: 1px solid #c8c8c8; border-radius: 6px; }
  .banner { margin: 0 0 1rem; padding: .5rem .75rem; background: #fff4d6; border: 1px solid #b58a00; border-radius: 4px; }
  h1 { font-size: 1.4rem; margin: 0 0 .5rem; }
  fieldset { border: 1px solid #c8c8c8; border-radius: 4px; margin: 1rem 0; padding: .75rem 1rem 1rem; }
  legend { font-weight: 600; padding: 0 .25rem; }
  .choice { display: flex; gap: .5rem; align-items: center; margin: .25rem 0; }
  .field { margin: .75rem 0 0; }
  .field label { display: block; font-weight: 600; }
  .field input { font: inherit; width: 100%; box-sizing: border-box; padding: .4rem .5rem; border: 1px solid #666; border-radius: 4px; }
  .hint { margin: .1rem 0 0; color: #4a4a4a; font-size: .9rem; }
  .error { margin: .1rem 0 0; color: #a00000; font-weight: 600; }
  input[aria-invalid="true"] { border: 2px solid #a00000; }
  .summary { border: 2px solid #a00000; border-radius: 4px; padding: .5rem 1rem; margin: 1rem 0; }
  .summary h2 { font-size: 1.1rem; margin: 0; }
  button { font: inherit; font-weight: 600; padding: .55rem 1.1rem; border-radius: 4px; border: 2px solid #12436d; background: #12436d; color: #fff; cursor: pointer; }
  :focus-visible { outline: 3px solid #b58a00; outline-offset: 2px; }
`;

function field(name: keyof OnboardingValues, values: OnboardingValues, errors: FieldErrors, hint?: string, extra = ''): string {
  const error = errors[name];
  const describedBy = [hint ? `${name}-hint` : '', error ? `${name}-error` : ''].filter(Boolean).join(' ');
  return `<div class="field">
      <label for="${name}">${escapeHtml(FIELD_LABELS[name])}</label>
      ${hint ? `<p class="hint" id="${name}-hint">${escapeHtml(hint)}</p>` : ''}
      ${error ? `<p class="error" id="${name}-error">${escapeHtml(error)}</p>` : ''}
      <input id="${name}" name="${name}" type="text" value="${escapeHtml(values[name])}" autocomplete="off" spellcheck="false"${
        describedBy ? ` aria-describedby="${describedBy}"` : ''
      }${error ? ' aria-invalid="true"' : ''}${extra}>
    </div>`;
}

export function renderOnboardingPage(opts: {
  token: string;
  accountId: string;
  email: string | null;
  values: OnboardingValues;
  errors: FieldErrors;
}): string {
  const { token, accountId, email, values, errors } = opts;
  const errorEntries = Object.entries(errors) as Array<[keyof OnboardingValues, string]>;
  const summary = errorEntries.length
    ? `<div class="summary" role="alert" tabindex="-1" autofocus>
      <h2>Please correct the following</h2>
      <ul>${errorEntries.map(([name, message]) => `<li><a href="#${name}">${escapeHtml(FIELD_LABELS[name])}: ${escapeHtml(message)}</a></li>`).join('')}</ul>
    </div>`
    : '';
  const who = email ? `${escapeHtml(email)} (account ${escapeHtml(accountId)})` : `account ${escapeHtml(accountId)}`;
  return `<!doctype html>
<html lang="en">
<head>
  <meta charset="utf-8">
  <meta name="viewport" content="width=device-width, initial-scale=1">
  <title>${PAGE_TITLE}</title>
  <style>${STYLE}</style>
</head>
<body>
  <main>
    <p class="banner">Cupel's local payments fake: a test service on this computer. No real money moves and nothing you type leaves this machine.</p>
    <h1>${PAGE_TITLE}</h1>
    <p>Choose where payouts for ${who} should go. The test details are filled in already.</p>
    ${summary}
    <form method="post" action="/onboard/${escapeHtml(encodeURIComponent(token))}">
      <fieldset>
        <legend>Payout method</legend>
        <div class="choice">
          <input type="radio" id="method-card" name="method" value="card"${values.method === 'card' ? ' checked' : ''}>
          <label for="method-card">Test debit card (standard or instant payouts)</label>
        </div>
        <div class="choice">
          <input type="radio" id="method-bank" name="method" value="bank"${values.method === 'bank' ? ' checked' : ''}>
          <label for="method-bank">Test bank account (standard payouts)</label>
        </div>
      </fieldset>
      <fieldset>
        <legend>Test debit card (used when “Test debit card” is chosen)</legend>
        ${field('card_number', values, errors, 'Test Visa debit card: 4000 0566 5566 5556.', ' inputmode="numeric"')}
        ${field('card_exp', values, errors, 'Any future month, for example 12/34.')}
        ${field('card_name', values, errors)}
      </fieldset>
      <fieldset>
        <legend>Test bank account (used when “Test bank account” is chosen)</legend>
        ${field('routing_number', values, errors, 'Test routing number: 110000000.', ' inputmode="numeric"')}
        ${field('account_number', values, errors, 'Test account number: 000123456789.', ' inputmode="numeric"')}
        ${field('account_holder_name', values, errors)}
      </fieldset>
      <button type="submit">Finish setup</button>
    </form>
  </main>
</body>
</html>`;
}

export function renderMessagePage(heading: string, message: string): string {
  return `<!doctype html>
<html lang="en">
<head>
  <meta charset="utf-8">
  <meta name="viewport" content="width=device-width, initial-scale=1">
  <title>${escapeHtml(heading)} — ${PAGE_TITLE}</title>
  <style>${STYLE}</style>
</head>
<body>
  <main>
    <p class="banner">Cupel's local payments fake: a test service on this computer.</p>
    <h1>${escapeHtml(heading)}</h1>
    <p>${escapeHtml(message)}</p>
  </main>
</body>
</html>`;
}
