import { cn } from "../../../utils/cn";
import { mailtoHref, telHref } from "../utils/format";

const linkClass = "font-medium text-copper-700 underline decoration-copper-300 underline-offset-2 hover:text-copper-800 break-all";

/** The contractor's e-mail (mailto) and phone (tel) as links; nothing when neither is known. */
export function ContractorContact({ contactEmail, phone, className }: { contactEmail: string | null; phone: string | null; className?: string }) {
  const tel = phone ? telHref(phone) : null;
  if (!contactEmail && !phone) return null;
  return (
    <ul className={cn("space-y-0.5 text-sm text-ink-700", className)}>
      {contactEmail ? (
        <li>
          <span className="text-ink-500">E-mail </span>
          <a href={mailtoHref(contactEmail)} className={linkClass}>
            {contactEmail}
          </a>
        </li>
      ) : null}
      {phone ? (
        <li>
          <span className="text-ink-500">Phone </span>
          {tel ? (
            <a href={tel} className={linkClass}>
              {phone}
            </a>
          ) : (
            <span>{phone}</span>
          )}
        </li>
      ) : null}
    </ul>
  );
}
