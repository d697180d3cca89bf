import { Attachment } from "./attachment.entity.js";
import { Client } from "./client.entity.js";
import { Company } from "./company.entity.js";
import { Invitation } from "./invitation.entity.js";
import { Job } from "./job.entity.js";
import { LimitProfile } from "./limit-profile.entity.js";
import { Membership } from "./membership.entity.js";
import { PasswordReset } from "./password-reset.entity.js";
import { PriceItem } from "./price-item.entity.js";
import { Estimate } from "./estimate.entity.js";
import { Quote, QuoteEvent } from "./quote.entity.js";
import { System } from "./system.entity.js";
import { DepositCheckout, Payment, PaymentRefund, StripeEvent } from "./payment.entity.js";
import { User } from "./user.entity.js";

/** Every entity, in one list for the DataSource. */
export const entities = [Company, User, Membership, Invitation, PasswordReset, Client, Job, LimitProfile, System, Attachment, PriceItem, Estimate, Quote, QuoteEvent, DepositCheckout, Payment, PaymentRefund, StripeEvent];
export { DepositCheckout, Payment, PaymentRefund, StripeEvent };
export { Attachment, Client, Company, Estimate, PriceItem, Quote, QuoteEvent, Invitation, Job, LimitProfile, Membership, PasswordReset, System, User };
