// The test cards the stand-in knows and the checks on the payment page's fields.

export type CardOutcome = "succeeded" | "declined" | "retry";

export interface TestCard {
  number: string;
  outcome: CardOutcome;
  description: string;
}

/** Shown on the payment page, in this order. */
export const TEST_CARDS: readonly TestCard[] = [
  { number: "4242 4242 4242 4242", outcome: "succeeded", description: "The payment succeeds." },
  { number: "4000 0000 0000 0002", outcome: "declined", description: "The card is declined." },
  { number: "4000 0000 0000 0119", outcome: "retry", description: "A processing error; trying again can succeed." },
];

const OUTCOMES = new Map(TEST_CARDS.map((card) => [card.number.replace(/ /g, ""), card.outcome]));

/** The outcome of a card number (spaces and dashes ignored); undefined when it is not a test card. */
export function cardOutcome(cardNumber: string): CardOutcome | undefined {
  return OUTCOMES.get(cardNumber.replace(/[\s-]/g, ""));
}

export const MESSAGES = {
  declined: "Your card was declined. Try another card.",
  retry: "We could not process your card just now. Please try again.",
} as const;

export interface CardForm {
  email: string;
  cardNumber: string;
  expiry: string;
  cvc: string;
  name: string;
}

export type CardField = keyof CardForm;

/** The label of each field; error messages start with it so they name the field. */
export const FIELD_LABELS: Record<CardField, string> = {
  email: "Email",
  cardNumber: "Card number",
  expiry: "Expiry (MM / YY)",
  cvc: "CVC",
  name: "Name on card",
};

/** The form as posted; anything missing or not a string is empty. */
export function readCardForm(body: unknown): CardForm {
  const source = (body ?? {}) as Record<string, unknown>;
  const text = (key: CardField) => (typeof source[key] === "string" ? (source[key] as string) : "");
  return { email: text("email"), cardNumber: text("cardNumber"), expiry: text("expiry"), cvc: text("cvc"), name: text("name") };
}

/** Field → message for every field that is not acceptable; empty when the form can be charged. */
export function checkCardForm(form: CardForm, now = new Date()): Partial<Record<CardField, string>> {
  const errors: Partial<Record<CardField, string>> = {};
  if (!/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(form.email.trim())) {
    errors.email = `${FIELD_LABELS.email}: enter an email address such as name@example.com.`;
  }
  if (cardOutcome(form.cardNumber) === undefined) {
    errors.cardNumber = `${FIELD_LABELS.cardNumber}: use one of the test cards listed on this page.`;
  }
  if (!isFutureExpiry(form.expiry, now)) {
    errors.expiry = `${FIELD_LABELS.expiry}: enter a month and year that have not passed, such as 12 / 34.`;
  }
  if (!/^\d{3,4}$/.test(form.cvc.trim())) {
    errors.cvc = `${FIELD_LABELS.cvc}: enter the 3 or 4 digits.`;
  }
  if (form.name.trim() === "") {
    errors.name = `${FIELD_LABELS.name}: enter the name printed on the card.`;
  }
  return errors;
}

/** "MM/YY", "MM / YY" or "MMYY"; a card is good through the end of its month. */
export function isFutureExpiry(expiry: string, now = new Date()): boolean {
  const match = /^\s*(\d{1,2})\s*\/?\s*(\d{2})\s*$/.exec(expiry);
  if (!match) return false;
  const month = Number(match[1]);
  const year = 2000 + Number(match[2]);
  if (month < 1 || month > 12) return false;
  const thisYear = now.getFullYear();
  const thisMonth = now.getMonth() + 1;
  return year > thisYear || (year === thisYear && month >= thisMonth);
}
