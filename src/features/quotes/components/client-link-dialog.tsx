import { useRef, useState } from "react";
import { Dialog } from "../../../components/ui/dialog";
import { controlClass, primaryButtonClass, secondaryButtonClass } from "../../../components/ui/form";

/** The link as the client opens it: a path from the server becomes an address on this site. */
const fullUrl = (url: string) => (/^https?:\/\//i.test(url) ? url : new URL(url, window.location.origin).toString());

/** A fresh client link, with a button that copies it. */
export function ClientLinkDialog({ url, onClose }: { url: string; onClose: () => void }) {
  const input = useRef<HTMLInputElement>(null);
  const [copied, setCopied] = useState<"yes" | "no" | null>(null);
  const link = fullUrl(url);

  const copy = async () => {
    try {
      if (!navigator.clipboard) throw new Error("no clipboard");
      await navigator.clipboard.writeText(link);
      setCopied("yes");
    } catch {
      input.current?.select();
      setCopied("no");
    }
  };

  return (
    <Dialog
      size="md"
      title="New client link"
      description="Anyone with this link can open the quote, accept it and pay the deposit. The link before it no longer works."
      onClose={onClose}
      footer={
        <>
          <button type="button" onClick={onClose} className={secondaryButtonClass}>
            Close
          </button>
          <button type="button" onClick={() => void copy()} className={primaryButtonClass}>
            Copy link
          </button>
        </>
      }
    >
      <label htmlFor="client-link" className="block text-sm font-medium text-ink-800">
        Client link
      </label>
      <input id="client-link" ref={input} readOnly value={link} onFocus={(e) => e.currentTarget.select()} className={`${controlClass} mt-1 font-mono text-xs`} />
      <p role="status" className="mt-2 min-h-5 text-sm text-ink-600">
        {copied === "yes" ? "Copied." : copied === "no" ? "The link is selected: copy it with Ctrl+C (⌘C on a Mac)." : ""}
      </p>
    </Dialog>
  );
}
