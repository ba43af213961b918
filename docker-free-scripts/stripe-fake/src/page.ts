import type Stripe from 'stripe';
import { TEST_CARDS } from './cards.js';

const ZERO_DECIMAL = new Set(['jpy', 'krw', 'vnd', 'clp', 'xaf', 'xof']);

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

/** Minor units to a display string without a float: the digits are split, then Intl formats the decimal string. */
export function formatMinor(amount: number, currency: string): string {
  const digits = ZERO_DECIMAL.has(currency) ? 0 : 2;
  const abs = String(Math.abs(amount)).padStart(digits + 1, '0');
  const decimal = `${amount < 0 ? '-' : ''}${digits ? `${abs.slice(0, -digits)}.${abs.slice(-digits)}` : abs}`;
  return new Intl.NumberFormat('en-GB', { style: 'currency', currency: currency.toUpperCase() }).format(decimal as unknown as number);
}

const STYLE = `
  :root { color-scheme: light; }
  * { box-sizing: border-box; }
  body { margin: 0; background: #f4f0e6; color: #1e2a32; font: 17px/1.5 system-ui, sans-serif; }
  main { max-width: 30rem; margin: 0 auto; padding: 1rem; }
  .notice { border: 2px dashed #1e2a32; background: #fffdf7; padding: .6rem .8rem; font-weight: 600; }
  h1 { font-size: 1.35rem; margin: 1rem 0 .25rem; }
  .amount { font-size: 1.8rem; font-weight: 700; font-variant-numeric: tabular-nums; margin: .25rem 0 1rem; }
  ul.items { padding-left: 1.2rem; }
  label { display: block; font-weight: 600; margin-top: .9rem; }
  input { width: 100%; font: inherit; padding: .6rem; border: 1px solid #4d5a63; border-radius: 4px; background: #fff; color: #1e2a32; min-height: 44px; }
  input::placeholder { color: #5d6a73; }
  input:focus, button:focus { outline: 3px solid #1d4f91; outline-offset: 2px; }
  .row { display: flex; gap: .75rem; } .row > div { flex: 1; }
  button { font: inherit; font-weight: 700; min-height: 44px; padding: .6rem 1rem; border-radius: 4px; cursor: pointer; }
  .pay { width: 100%; margin-top: 1.25rem; background: #1d4f91; color: #fff; border: 0; }
  .cancel { width: 100%; margin-top: .75rem; background: transparent; color: #1e2a32; border: 1px solid #4d5a63; }
  .problem { border-left: 6px solid #8a3b12; background: #fff6ef; padding: .6rem .8rem; margin: 1rem 0; }
  .problem strong { display: block; }
  details { margin-top: 1.5rem; } table { border-collapse: collapse; width: 100%; } td { padding: .2rem .4rem; border-top: 1px solid #d6cfbd; }
  code { font-variant-numeric: tabular-nums; }
`;

function shell(title: string, body: string): string {
  return `<!doctype html>
<html lang="en-GB">
<head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(title)}</title><style>${STYLE}</style></head>
<body><main>
<p class="notice" role="note">Test payment page — no real card is charged.</p>
${body}
</main></body></html>`;
}

export function payPage(session: Stripe.Checkout.Session, lineItems: Stripe.LineItem[], problem: string | null, card = ''): string {
  const total = formatMinor(session.amount_total ?? 0, session.currency ?? 'gbp');
  if (session.status !== 'open') {
    const what = session.status === 'complete' ? 'This payment has been made. You can close this page.' : 'This payment page has expired. Go back to the workshop’s page to start again.';
    return shell('Payment', `<h1>Payment of ${esc(total)}</h1><p>${esc(what)}</p>`);
  }
  const items = lineItems.map((li) => `<li>${esc(li.description ?? 'Item')} — ${esc(formatMinor(li.amount_total, li.currency))}</li>`).join('');
  const cards = Object.entries(TEST_CARDS)
    .map(([n, c]) => `<tr><td><code>${n.replace(/(\d{4})(?=\d)/g, '$1 ')}</code></td><td>${esc(c.label)}</td></tr>`)
    .join('');
  const error = problem
    ? `<div class="problem" role="alert" id="pay-problem"><strong>The payment did not go through.</strong>${esc(problem)} Try again with another card.</div>`
    : '';
  return shell(
    'Pay by card',
    `<h1>Pay by card</h1>
<p class="amount" aria-label="Amount to pay">${esc(total)}</p>
<ul class="items">${items}</ul>
${error}
<form method="post" action="/pay/${esc(session.id)}" novalidate>
  <label for="card">Card number</label>
  <input id="card" name="card" inputmode="numeric" autocomplete="off" value="${esc(card)}" required ${problem ? 'aria-describedby="pay-problem"' : ''}>
  <div class="row">
    <div><label for="expiry">Expiry (MM/YY)</label><input id="expiry" name="expiry" inputmode="numeric" autocomplete="off" placeholder="12/34"></div>
    <div><label for="cvc">Security code</label><input id="cvc" name="cvc" inputmode="numeric" autocomplete="off" placeholder="123"></div>
  </div>
  <button class="pay" type="submit" name="action" value="pay">Pay ${esc(total)}</button>
  <button class="cancel" type="submit" name="action" value="cancel" formnovalidate>Cancel and go back</button>
</form>
<details><summary>Test cards this page accepts</summary><table>${cards}</table>
<p>Any future expiry date and any three digits work as the security code.</p></details>`,
  );
}

export function notFoundPage(): string {
  return shell('Payment not found', '<h1>Payment not found</h1><p>This payment link is not known. Go back to the workshop’s page to start again.</p>');
}
