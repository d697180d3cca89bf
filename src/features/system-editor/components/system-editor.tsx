import { useQueryClient } from "@tanstack/react-query";
import { useCallback, useDeferredValue, useEffect, useId, useMemo, useRef, useState } from "react";
import { Link, useBlocker } from "react-router-dom";
import { roleCan } from "../../../../shared/permissions";
import type { SystemInput } from "../../../../shared/engine/schema";
import type { SystemRecord } from "../../../../shared/schemas/jobs";
import { ConfirmDialog } from "../../../components/ui/confirm-dialog";
import { controlClass, FormAlert, primaryButtonClass, secondaryButtonClass } from "../../../components/ui/form";
import { paths } from "../../../config/paths";
import { ApiError, apiFieldErrors } from "../../../lib/api-client";
import { cn } from "../../../utils/cn";
import { useSignedInSession } from "../../auth/hooks/session-context";
import type { AutosizeAnswer } from "../../systems/api/autosize-system";
import { useAutosizeSystem } from "../../systems/api/autosize-system";
import { useJob } from "../../systems/api/get-job";
import { useLimitProfiles } from "../../systems/api/get-limit-profiles";
import { systemQueryOptions } from "../../systems/api/get-system";
import { conflictDetails, documentFieldErrors, useSaveSystem } from "../../systems/api/save-system";
import { useLiveSolve } from "../hooks/use-live-solve";
import type { Selection } from "../selection";
import { EntryTables, UnitsSwitch, convertUnits, type TableTab } from "../tables";
import { errorsByPath, loadRows, TAB_OF_KIND } from "../lib/results";
import { AutosizeDialog } from "./autosize-dialog";
import { CautionsPanel } from "../../../components/ui/cautions-panel";
import { ConflictDialog } from "./conflict-dialog";
import { NominalVoltageField } from "./nominal-voltage-field";
import { OneLineDiagram } from "./one-line-diagram";
import { ResultsPanel } from "./results-panel";
import { inlineControlClass } from "./control";
import { RunsCsvControls } from "./runs-csv-controls";

/** The stored network as the editor's document (the server keeps it in the network file format). */
export function documentOf(record: SystemRecord): SystemInput {
  const d = record.document as Partial<SystemInput>;
  return {
    ...d,
    format: "runwright-system/1",
    units: d.units ?? record.units,
    nominalVoltage: d.nominalVoltage ?? record.nominalVoltage,
    points: Array.isArray(d.points) ? d.points : [],
    sources: Array.isArray(d.sources) ? d.sources : [],
    runs: Array.isArray(d.runs) ? d.runs : [],
    loads: Array.isArray(d.loads) ? d.loads : [],
  } as SystemInput;
}

interface Saved {
  doc: SystemInput;
  name: string;
  limitProfileId: string | null;
}

type Conflict = NonNullable<ReturnType<typeof conflictDetails>>;

export interface SystemEditorProps {
  jobId: string;
  /** The system as loaded; the editor keeps its own copy from here on. */
  record: SystemRecord;
}

/** The System editor: header, entry tables, one-line diagram, live results, cautions, auto-size and save. */
export function SystemEditor({ jobId, record }: SystemEditorProps) {
  const session = useSignedInSession();
  const canWrite = roleCan(session.role, "jobs:write");
  const queryClient = useQueryClient();
  const job = useJob(jobId);
  const profiles = useLimitProfiles();
  const nameId = useId();
  const profileId = useId();

  const [saved, setSaved] = useState<Saved>(() => ({ doc: documentOf(record), name: record.name, limitProfileId: record.limitProfileId }));
  const [doc, setDoc] = useState<SystemInput>(saved.doc);
  const [name, setName] = useState(record.name);
  const [limitProfileId, setLimitProfileId] = useState<string | null>(record.limitProfileId);
  const [version, setVersion] = useState(record.version);
  const [selection, setSelection] = useState<Selection | null>(null);
  const [tab, setTab] = useState<TableTab>("runs");
  const [caseChoice, setCaseChoice] = useState<{ load: string | null; name: string } | null>(null);

  const [saveFieldErrors, setSaveFieldErrors] = useState<Record<string, string>>({});
  const [nameError, setNameError] = useState<string | null>(null);
  const [saveError, setSaveError] = useState<string | null>(null);
  const [conflict, setConflict] = useState<Conflict | null>(null);
  const [conflictPending, setConflictPending] = useState<"reload" | "overwrite" | null>(null);
  const [conflictError, setConflictError] = useState<string | null>(null);
  const [proposal, setProposal] = useState<AutosizeAnswer | null>(null);
  const [autosizeError, setAutosizeError] = useState<string | null>(null);

  const save = useSaveSystem();
  const autosize = useAutosizeSystem();
  const live = useLiveSolve(record.id, doc);

  // Dirty: the document, the name or the profile differ from what was last saved or loaded.
  const savedJson = useMemo(() => JSON.stringify(saved.doc), [saved.doc]);
  const docJson = useMemo(() => (doc === saved.doc ? savedJson : JSON.stringify(doc)), [doc, saved.doc, savedJson]);
  const dirty = canWrite && (docJson !== savedJson || name !== saved.name || limitProfileId !== saved.limitProfileId);

  // A layout that solves again clears the field errors of an earlier refused save.
  useEffect(() => {
    if (live.lastGood && !live.failure && live.answeredDoc === doc) setSaveFieldErrors((e) => (Object.keys(e).length ? {} : e));
  }, [live.lastGood, live.failure, live.answeredDoc, doc]);

  // The diagram and the results render at low priority: a keystroke, a commit or a focus change in
  // the entry tables is painted first and interrupts them, and a solve's answer is drawn between
  // keystrokes instead of in one long task (bench:editor with 500 loads measured keys waiting up to
  // 1.2 s behind the answer's render before this).
  const viewDoc = useDeferredValue(doc);
  const viewSelection = useDeferredValue(selection);
  const answer = useMemo(() => ({ result: live.lastGood, doc: live.lastGoodDoc }), [live.lastGood, live.lastGoodDoc]);
  const viewAnswer = useDeferredValue(answer);
  const viewLive = useMemo(() => ({ ...live, lastGood: viewAnswer.result, lastGoodDoc: viewAnswer.doc }), [live, viewAnswer]);

  const tableErrors = useMemo(() => ({ ...(live.failure ? errorsByPath(live.failure.errors) : {}), ...saveFieldErrors }), [live.failure, saveFieldErrors]);

  const onSelect = useCallback((next: Selection | null) => {
    setSelection(next);
    if (next) setTab(TAB_OF_KIND[next.kind]);
  }, []);

  // The load the charts follow (the selected one, else the worst) and the case shown.
  const rows = useMemo(() => (live.lastGood && live.lastGoodDoc ? loadRows(live.lastGoodDoc, live.lastGood) : []), [live.lastGood, live.lastGoodDoc]);
  const selectedLoad = selection?.kind === "load" ? rows.find((r) => r.id === selection.id) : undefined;
  const chartLoadId = selectedLoad?.id ?? rows[0]?.id ?? null;
  const defaultCase = selectedLoad?.worst.worstCase ?? live.lastGood?.cases[0]?.name ?? null;
  const caseName = caseChoice && caseChoice.load === (selectedLoad?.id ?? null) ? caseChoice.name : defaultCase;
  const onCaseChange = useCallback((next: string) => setCaseChoice({ load: selectedLoad?.id ?? null, name: next }), [selectedLoad?.id]);

  const resetFrom = useCallback((fresh: SystemRecord) => {
    const next = documentOf(fresh);
    setSaved({ doc: next, name: fresh.name, limitProfileId: fresh.limitProfileId });
    setDoc(next);
    setName(fresh.name);
    setLimitProfileId(fresh.limitProfileId);
    setVersion(fresh.version);
    setSaveFieldErrors({});
    setNameError(null);
    setSaveError(null);
  }, []);

  const runSave = useCallback(
    (withVersion: number, onDone?: () => void) => {
      const trimmed = name.trim();
      if (!trimmed) {
        setNameError("Give the system a name");
        onDone?.();
        return;
      }
      const sent: Saved = { doc, name, limitProfileId };
      setSaveError(null);
      setNameError(null);
      save.mutate(
        { systemId: record.id, version: withVersion, name: trimmed, limitProfileId, document: doc },
        {
          onSuccess: (saved) => {
            setVersion(saved.version);
            setSaved(sent);
            setSaveFieldErrors({});
            setConflict(null);
            setConflictError(null);
          },
          onError: (error) => {
            const details = conflictDetails(error);
            if (details) {
              setConflict(details);
              if (conflict) setConflictError("It was changed again in the meantime; choose again.");
              return;
            }
            setConflict(null);
            if (error instanceof ApiError && error.status === 400) {
              const { document, other } = documentFieldErrors(apiFieldErrors(error));
              setSaveFieldErrors(document);
              if (other.name) setNameError(other.name);
              const rest = Object.entries(other).filter(([k]) => k !== "name");
              setSaveError(Object.keys(document).length > 0 ? `Not saved: ${error.message}` : rest.length > 0 ? rest.map(([, m]) => m).join(" ") : other.name ? null : error.message);
              return;
            }
            setSaveError(error.message);
          },
          onSettled: () => onDone?.(),
        },
      );
    },
    [conflict, doc, limitProfileId, name, record.id, save],
  );

  const onSave = useCallback(() => {
    if (!canWrite || save.isPending) return;
    runSave(version);
  }, [canWrite, runSave, save.isPending, version]);

  // Ctrl+S / ⌘S saves (when there is something to save).
  const saveRef = useRef({ onSave, dirty });
  saveRef.current = { onSave, dirty };
  useEffect(() => {
    const onKey = (event: KeyboardEvent) => {
      if ((event.ctrlKey || event.metaKey) && event.key.toLowerCase() === "s") {
        event.preventDefault();
        if (saveRef.current.dirty) saveRef.current.onSave();
      }
    };
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, []);

  // Leaving with unsaved changes: the browser asks on reload/close; the app asks on navigation.
  useEffect(() => {
    if (!dirty) return;
    const onBeforeUnload = (event: BeforeUnloadEvent) => {
      event.preventDefault();
      event.returnValue = "";
    };
    window.addEventListener("beforeunload", onBeforeUnload);
    return () => window.removeEventListener("beforeunload", onBeforeUnload);
  }, [dirty]);
  const blocker = useBlocker(({ currentLocation, nextLocation }) => dirty && currentLocation.pathname !== nextLocation.pathname);

  const reloadTheirs = async () => {
    setConflictPending("reload");
    setConflictError(null);
    try {
      const fresh = await queryClient.fetchQuery({ ...systemQueryOptions(record.id), staleTime: 0 });
      resetFrom(fresh);
      setConflict(null);
    } catch (error) {
      setConflictError(error instanceof Error ? error.message : "Their version could not be loaded.");
    } finally {
      setConflictPending(null);
    }
  };
  const overwrite = () => {
    if (!conflict) return;
    setConflictPending("overwrite");
    setConflictError(null);
    runSave(conflict.currentVersion, () => setConflictPending(null));
  };

  const startAutosize = () => {
    setAutosizeError(null);
    autosize.mutate({ systemId: record.id, document: doc }, { onSuccess: setProposal, onError: (error) => setAutosizeError(error.message) });
  };
  const applyProposal = () => {
    if (proposal?.ok) setDoc(proposal.system);
    setProposal(null);
  };

  const profileChanged = limitProfileId !== saved.limitProfileId;
  const jobTitle = job.data?.title ?? (job.isPending ? "Job" : "Back to the job");

  return (
    <div className="space-y-4">
      <header className="space-y-3 border-b border-ink-100 pb-4">
        <Link to={paths.job.getHref(jobId)} className="text-sm font-medium text-copper-700 hover:text-copper-600">
          ← {jobTitle}
        </Link>
        <div className="flex flex-wrap items-end gap-4">
          <div className="min-w-[14rem] flex-1 space-y-1">
            <label htmlFor={nameId} className="block text-xs font-medium text-ink-600">
              System name
            </label>
            <input
              id={nameId}
              type="text"
              value={name}
              readOnly={!canWrite}
              maxLength={120}
              aria-invalid={Boolean(nameError)}
              aria-describedby={nameError ? `${nameId}-error` : undefined}
              onChange={(event) => setName(event.target.value)}
              className={cn(controlClass, "py-1.5 text-lg font-semibold", !canWrite && "border-transparent bg-transparent px-0")}
            />
            {nameError ? (
              <p id={`${nameId}-error`} className="text-xs font-medium text-over-700">
                {nameError}
              </p>
            ) : null}
          </div>
          <NominalVoltageField value={doc.nominalVoltage} disabled={!canWrite} onChange={(volts) => setDoc((d) => ({ ...d, nominalVoltage: volts }))} />
          <div className="space-y-1">
            <label htmlFor={profileId} className="block text-xs font-medium text-ink-600">
              Limit profile
            </label>
            <select
              id={profileId}
              value={limitProfileId ?? ""}
              disabled={!canWrite || profiles.isPending}
              onChange={(event) => setLimitProfileId(event.target.value === "" ? null : event.target.value)}
              className={cn(inlineControlClass, "max-w-[18rem] py-1.5")}
            >
              <option value="">Default limits (3 % branch, 5 % total)</option>
              {profiles.data?.items.map((p) => (
                <option key={p.id} value={p.id}>
                  {p.name}
                </option>
              ))}
              {limitProfileId && profiles.data && !profiles.data.items.some((p) => p.id === limitProfileId) ? <option value={limitProfileId}>Current profile</option> : null}
            </select>
          </div>
          <div className="space-y-1">
            <span className="block text-xs font-medium text-ink-600" aria-hidden="true">
              Units
            </span>
            <UnitsSwitch value={doc.units} disabled={!canWrite} onChange={(units) => setDoc((d) => (d.units === units ? d : convertUnits(d, units)))} />
          </div>
        </div>
        {profiles.error ? <p className="text-xs text-over-700">The limit profiles could not be loaded: {profiles.error.message}</p> : null}
        {profileChanged ? <p className="text-xs text-near-700">The results use the saved limit profile: save to check the loads against the one chosen.</p> : null}
        <div className="flex flex-wrap items-center gap-2">
          {canWrite ? (
            <>
              <button type="button" onClick={onSave} disabled={!dirty || save.isPending} className={primaryButtonClass} title="Save (Ctrl+S)">
                {save.isPending ? "Saving…" : "Save"}
              </button>
              <span role="status" className={cn("text-sm", dirty ? "font-medium text-near-700" : "text-within-700")}>
                {save.isPending ? "Saving…" : dirty ? "Unsaved changes" : "Saved"}
              </span>
              <button type="button" onClick={startAutosize} disabled={autosize.isPending} aria-busy={autosize.isPending} className={secondaryButtonClass}>
                Auto-size
              </button>
              {autosize.isPending ? (
                <span role="status" className="inline-flex items-center gap-1 text-sm text-ink-600">
                  <span aria-hidden="true" className="h-2 w-2 animate-pulse rounded-full bg-copper-400" />
                  Finding the cheapest sizes…
                </span>
              ) : null}
            </>
          ) : (
            <p className="text-sm text-ink-500">Read-only: your role can view this system but not change it.</p>
          )}
          <div className="ml-auto">
            <RunsCsvControls systemId={record.id} version={version} canImport={canWrite} dirty={dirty} onImported={resetFrom} />
          </div>
        </div>
        <FormAlert message={saveError} />
        <FormAlert message={autosizeError ? `Auto-size failed: ${autosizeError}` : null} />
      </header>

      <div className="grid gap-4 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="min-w-0">
          <EntryTables value={doc} onChange={setDoc} selection={selection} onSelect={onSelect} errors={tableErrors} readOnly={!canWrite} tab={tab} onTabChange={setTab} />
        </div>
        <div className="min-w-0 space-y-4">
          <OneLineDiagram doc={viewDoc} result={viewAnswer.result} caseName={caseName} selection={viewSelection} onSelect={onSelect} />
          <CautionsPanel extra={live.lastGood?.cautions ?? live.failure?.cautions ?? []} />
        </div>
      </div>

      <ResultsPanel doc={viewDoc} live={viewLive} selection={viewSelection} onSelect={onSelect} caseName={caseName} onCaseChange={onCaseChange} chartLoadId={chartLoadId} />

      {proposal ? <AutosizeDialog answer={proposal} onApply={applyProposal} onDiscard={() => setProposal(null)} /> : null}
      {conflict ? (
        <ConflictDialog details={conflict} pending={conflictPending} error={conflictError} onReload={() => void reloadTheirs()} onOverwrite={overwrite} onClose={() => setConflict(null)} />
      ) : null}
      {blocker.state === "blocked" ? (
        <ConfirmDialog title="Leave without saving?" confirmLabel="Leave without saving" cancelLabel="Stay" onConfirm={() => blocker.proceed()} onCancel={() => blocker.reset()}>
          Your changes to this system are not saved.
        </ConfirmDialog>
      ) : null}
    </div>
  );
}
