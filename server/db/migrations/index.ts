import { CreateCompany1796164474353 } from "./1796164474353-create-company.js";
import { CreateAccounts1796173602296 } from "./1796173602296-create-accounts.js";
import { CreateJobs1796179208698 } from "./1796179208698-create-jobs.js";
import { CreateEstimates1796191597104 } from "./1796191597104-create-estimates.js";
import { CreatePayments1796195312104 } from "./1796195312104-create-payments.js";
import { AddQuoteSendPending1796199345269 } from "./1796199345269-add-quote-send-pending.js";

// Every migration, oldest first. Listed as classes rather than a file glob so
// the same list loads under tsx, vitest and plain node; a test checks that
// every file in this folder is listed. Add each new migration here.
export const migrations = [CreateCompany1796164474353, CreateAccounts1796173602296, CreateJobs1796179208698, CreateEstimates1796191597104, CreatePayments1796195312104, AddQuoteSendPending1796199345269];
