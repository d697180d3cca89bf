import { FIELD_LABELS, TEST_CARDS, type CardField, type CardForm } from "./cards.js";
import type { SessionRecord } from "./store.js";

// The stand-in's own payment page: plain HTML with inline CSS, nothing loaded from elsewhere, usable on a phone.
// Everything printed goes through escapeHtml().

const SUFFIX = "local Stripe stand-in";

export function escapeHtml(value: string): string {
  return value
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

/** Minor units → "$12.50" (zero-decimal currencies such as JPY have no minor unit). */
export function formatAmount(amount: number, currency: string): string {
  const format = new Intl.NumberFormat("en", { style: "currency", currency: currency.toUpperCase() });
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
  return format.format(amount / 10 ** digits);
}

/** The success URL with the session id in place of {CHECKOUT_SESSION_ID}. */
export function successUrlOf(record: SessionRecord): string {
  return record.session.success_url.split("{CHECKOUT_SESSION_ID}").join(record.session.id);
}

const STYLE = `
*{box-sizing:border-box}
body{margin:0;font:16px/1.5 system-ui,-apple-system,"Segoe UI",Roboto,"Helvetica Neue",Arial,sans-serif;color:#1f2a30;background:#e9edef}
main{max-width:30rem;margin:0 auto;padding:1rem}
.test-strip{margin:0 0 1rem;padding:.5rem .75rem;border:2px dashed #b08a00;background:#fff8dc;color:#4d3c00;font-size:.9rem}
.panel{background:#fff;border:1px solid #c5cfd4;padding:1rem;margin-bottom:1rem}
h1{font-size:1.35rem;margin:0 0 .75rem}
h2{font-size:1rem;margin:0 0 .5rem;text-transform:uppercase;letter-spacing:.04em;color:#46565e}
ul.items{list-style:none;margin:0;padding:0}
ul.items li{display:flex;justify-content:space-between;gap:1rem;padding:.3rem 0;border-bottom:1px dotted #c5cfd4}
.total{display:flex;justify-content:space-between;margin:.5rem 0 0;font-size:1.15rem}
.field{margin-bottom:.8rem}
.field label{display:block;font-weight:600;margin-bottom:.2rem}
.field input{width:100%;padding:.55rem .6rem;font:inherit;border:1px solid #8a9aa2;background:#fbfcfc}
.field input:focus{outline:3px solid #7fb0c9;outline-offset:0}
.field input[aria-invalid=true]{border-color:#a12622;background:#fff4f3}
.field-error{margin:.2rem 0 0;color:#a12622;font-size:.9rem}
.pair{display:grid;grid-template-columns:1fr 1fr;gap:.75rem}
button{width:100%;padding:.75rem;font:inherit;font-weight:700;color:#fff;background:#2d5c46;border:0;cursor:pointer}
button:hover,button:focus{background:#214535}
.alert{margin:0 0 1rem;padding:.6rem .75rem;border-left:4px solid #a12622;background:#fff4f3;color:#5c1210}
.alert ul{margin:.3rem 0 0;padding-left:1.2rem}
.back{display:inline-block;margin-top:.75rem;color:#23506b}
table.cards{width:100%;border-collapse:collapse;font-size:.9rem}
table.cards th,table.cards td{text-align:left;padding:.25rem .4rem .25rem 0;vertical-align:top}
table.cards td:first-child{white-space:nowrap;font-family:ui-monospace,Menlo,Consolas,monospace}
@media (max-width:22rem){.pair{grid-template-columns:1fr}}
`;

function renderDocument(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="robots" content="noindex">
<title>${escapeHtml(title)} — ${SUFFIX}</title>
<style>${STYLE}</style>
</head>
<body>
<main>
<p class="test-strip"><strong>Local test page.</strong> No real money moves and card details go nowhere: only the test cards listed below work.</p>
${body}
</main>
</body>
</html>
`;
}

export interface PaymentPageState {
  /** What was typed, shown again after a failed attempt (the card number never is). */
  values?: Partial<CardForm>;
  fieldErrors?: Partial<Record<CardField, string>>;
  /** A message about the card as a whole (declined, processing error). */
  message?: string;
}

const FIELD_ORDER: CardField[] = ["email", "cardNumber", "expiry", "cvc", "name"];

export function renderPaymentPage(record: SessionRecord, state: PaymentPageState = {}): string {
  const { session, lineItems } = record;
  const total = formatAmount(session.amount_total, session.currency);
  const values: Partial<CardForm> = { email: session.customer_email ?? "", ...state.values, cardNumber: "" };
  const fieldErrors = state.fieldErrors ?? {};
  const problems = FIELD_ORDER.filter((field) => fieldErrors[field] !== undefined);

  const items = lineItems
    .map((item) => {
      const quantity = item.quantity > 1 ? ` × ${item.quantity}` : "";
      return `<li><span>${escapeHtml(item.name)}${quantity}</span><span>${escapeHtml(formatAmount(item.unitAmount * item.quantity, item.currency))}</span></li>`;
    })
    .join("\n");

  let alert = "";
  if (state.message !== undefined) {
    alert = `<div class="alert" role="alert">${escapeHtml(state.message)}</div>`;
  } else if (problems.length > 0) {
    const list = problems.map((field) => `<li>${escapeHtml(fieldErrors[field] as string)}</li>`).join("");
    alert = `<div class="alert" role="alert">Please check these fields:<ul>${list}</ul></div>`;
  }

  const input = (field: CardField, type: string, autocomplete: string, extra = "") => {
    const error = fieldErrors[field];
    const described = error === undefined ? "" : ` aria-invalid="true" aria-describedby="${field}-error"`;
    const errorLine = error === undefined ? "" : `\n<p class="field-error" id="${field}-error">${escapeHtml(error)}</p>`;
    return `<div class="field">
<label for="${field}">${escapeHtml(FIELD_LABELS[field])}</label>
<input id="${field}" name="${field}" type="${type}" autocomplete="${autocomplete}" value="${escapeHtml(values[field] ?? "")}" required${extra}${described}>${errorLine}
</div>`;
  };

  const cards = TEST_CARDS.map((card) => `<tr><td>${escapeHtml(card.number)}</td><td>${escapeHtml(card.description)}</td></tr>`).join("\n");

  return renderDocument(
    "Test payment",
    `<h1>Test payment</h1>
<section class="panel" aria-labelledby="order-heading">
<h2 id="order-heading">Order</h2>
<ul class="items">
${items}
</ul>
<p class="total"><span>Total</span><strong>${escapeHtml(total)}</strong></p>
</section>
<section class="panel" aria-labelledby="card-heading">
<h2 id="card-heading">Card details</h2>
${alert}
<form method="post" action="/pay/${escapeHtml(encodeURIComponent(session.id))}" novalidate>
${input("email", "email", "email")}
${input("cardNumber", "text", "cc-number", ' inputmode="numeric"')}
<div class="pair">
${input("expiry", "text", "cc-exp", ' inputmode="numeric" placeholder="MM / YY"')}
${input("cvc", "text", "cc-csc", ' inputmode="numeric"')}
</div>
${input("name", "text", "cc-name")}
<button type="submit">Pay ${escapeHtml(total)}</button>
</form>
<a class="back" href="${escapeHtml(session.cancel_url)}">← Back without paying</a>
</section>
<section class="panel" aria-labelledby="cards-list-heading">
<h2 id="cards-list-heading">Test cards</h2>
<table class="cards">
<thead><tr><th scope="col">Card number</th><th scope="col">What happens</th></tr></thead>
<tbody>
${cards}
</tbody>
</table>
<p>Any expiry that has not passed, any 3-digit CVC and any name will do.</p>
</section>`,
  );
}

export function renderCompletePage(record: SessionRecord): string {
  const { session } = record;
  return renderDocument(
    "Payment complete",
    `<section class="panel">
<h1>This payment is complete</h1>
<p>${escapeHtml(formatAmount(session.amount_total, session.currency))} was paid with a test card.</p>
<a class="back" href="${escapeHtml(successUrlOf(record))}">Continue</a>
</section>`,
  );
}

export function renderExpiredPage(record: SessionRecord): string {
  return renderDocument(
    "Payment page expired",
    `<section class="panel">
<h1>This payment page has expired</h1>
<p>Nothing was charged. Ask for a new payment link to pay.</p>
<a class="back" href="${escapeHtml(record.session.cancel_url)}">Go back</a>
</section>`,
  );
}

export function renderNotFoundPage(): string {
  return renderDocument(
    "Payment not found",
    `<section class="panel">
<h1>No such payment</h1>
<p>This payment link is not known to this test server (it may have been restarted, which forgets every payment).</p>
</section>`,
  );
}
