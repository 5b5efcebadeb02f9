"use client";

import { QueryClient, QueryClientProvider, useQuery } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useEffect, useRef, useState } from "react";
import { buttonClass } from "@/ui/button-class";
import { formatBytes, formatBytesOf } from "./format";
import { ProblemReport, type ApiProblem } from "./problem-report";
import { ProgressBar } from "./progress-bar";

type Phase =
  | { kind: "idle" }
  | { kind: "uploading"; loaded: number; total: number }
  | { kind: "checking"; total: number }
  | { kind: "job"; jobId: string; total: number }
  | { kind: "done"; datasetId: string; needsRoles: boolean }
  | { kind: "failed"; problem: ApiProblem; title: string };

type JobBody = {
  id: string;
  status: "queued" | "running" | "succeeded" | "failed";
  progress: { phase: string; done: number; total: number | null; message?: string } | null;
  result: { datasetId?: string; status?: string } | null;
  error: { message: string; details?: ApiProblem["details"] } | null;
  /** `page`: the page to open once the job has succeeded. */
  links?: { self: string; dataset?: string; page?: string };
};

/**
 * Upload of a spend history: the browser sends the file with XMLHttpRequest (upload progress events
 * drive the bar: "Uploading 42 MB of 100 MB"), then shows "Checking rows…": at once for small files
 * (the server answers when they are stored), or from the dataset.ingest job it polls for large ones.
 * Ends on the roles step (or the history's page), or with the one problem report.
 */
export function UploadForm({ inlineLimitBytes, maxBytes }: { inlineLimitBytes: number; maxBytes: number }) {
  const [client] = useState(() => new QueryClient({ defaultOptions: { queries: { retry: 2 } } }));
  return (
    <QueryClientProvider client={client}>
      <UploadFormInner inlineLimitBytes={inlineLimitBytes} maxBytes={maxBytes} />
    </QueryClientProvider>
  );
}

function UploadFormInner({ inlineLimitBytes, maxBytes }: { inlineLimitBytes: number; maxBytes: number }) {
  const router = useRouter();
  const [file, setFile] = useState<File | null>(null);
  const [name, setName] = useState("");
  const [phase, setPhase] = useState<Phase>({ kind: "idle" });
  const xhrRef = useRef<XMLHttpRequest | null>(null);
  const busy = phase.kind === "uploading" || phase.kind === "checking" || phase.kind === "job" || phase.kind === "done";

  const job = useQuery({
    queryKey: ["dataset-ingest-job", phase.kind === "job" ? phase.jobId : null],
    enabled: phase.kind === "job",
    queryFn: async (): Promise<JobBody> => {
      const response = await fetch(`/api/jobs/${(phase as { jobId: string }).jobId}`, { cache: "no-store" });
      if (!response.ok) throw new Error(`The server answered ${response.status}.`);
      return response.json();
    },
    refetchInterval: (query) => (query.state.data?.status === "succeeded" || query.state.data?.status === "failed" ? false : 500),
  });

  useEffect(() => {
    if (phase.kind !== "job" || !job.data) return;
    if (job.data.status === "succeeded" && job.data.result?.datasetId) {
      finish(job.data.result.datasetId, job.data.result.status !== "ready", job.data.links?.page);
    } else if (job.data.status === "failed") {
      const error = job.data.error ?? { message: "The upload failed." };
      setPhase({ kind: "failed", problem: { error: error.message, details: error.details ?? [] }, title: "Problems in the file" });
    }
  }, [job.data, phase.kind]);

  function finish(datasetId: string, needsRoles: boolean, page?: string) {
    setPhase({ kind: "done", datasetId, needsRoles });
    router.push(page ?? (needsRoles ? `/datasets/${datasetId}/roles` : `/datasets/${datasetId}`));
  }

  function choose(next: File | null) {
    setFile(next);
    setPhase({ kind: "idle" });
    if (next && next.size > maxBytes) {
      setPhase({
        kind: "failed",
        title: "This file is too large",
        problem: { error: `The file is ${formatBytes(next.size)}; the limit is ${formatBytes(maxBytes)}. Split it or aggregate the rows (e.g. weekly instead of daily).` },
      });
    }
  }

  function upload(event: React.FormEvent) {
    event.preventDefault();
    if (!file || busy) return;
    const params = new URLSearchParams({ filename: file.name });
    if (name.trim()) params.set("name", name.trim());
    const xhr = new XMLHttpRequest();
    xhrRef.current = xhr;
    xhr.open("POST", `/api/datasets?${params}`);
    xhr.setRequestHeader("Content-Type", "text/csv");
    xhr.responseType = "text";
    setPhase({ kind: "uploading", loaded: 0, total: file.size });
    xhr.upload.onprogress = (e) => setPhase({ kind: "uploading", loaded: e.loaded, total: e.lengthComputable ? e.total : file.size });
    xhr.upload.onload = () => setPhase({ kind: "checking", total: file.size });
    xhr.onerror = () => setPhase({ kind: "failed", title: "The upload did not get through", problem: { error: "The connection to the server was lost. Nothing was stored; try again." } });
    xhr.onabort = () => setPhase({ kind: "failed", title: "Upload cancelled", problem: { error: "You cancelled the upload. Nothing was stored." } });
    xhr.onload = () => {
      xhrRef.current = null;
      let body: unknown = null;
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        body = null;
      }
      if (xhr.status === 201) {
        const dataset = body as { id: string; status: string };
        finish(dataset.id, dataset.status !== "ready");
      } else if (xhr.status === 202) {
        const queued = body as { job: { id: string } };
        setPhase({ kind: "job", jobId: queued.job.id, total: file.size });
      } else {
        const problem = body && typeof body === "object" && "error" in body ? (body as ApiProblem) : { error: `The server answered ${xhr.status}.` };
        setPhase({ kind: "failed", problem, title: xhr.status === 413 || xhr.status === 422 ? "Problems in the file" : "The upload failed" });
      }
    };
    xhr.send(file);
  }

  const checkingBar = (() => {
    if (phase.kind === "checking") {
      return <ProgressBar testId="upload-progress" label="Checking rows…" detail={file && file.size > inlineLimitBytes ? "the server is reading the file" : undefined} value={null} />;
    }
    if (phase.kind === "job") {
      const p = job.data?.progress;
      const total = p?.total ?? phase.total;
      const label = p?.phase === "Storing" ? "Storing rows…" : p?.phase === "Stored" ? "Stored" : "Checking rows…";
      const detail = p?.message ?? (job.data?.status === "queued" ? "waiting for a worker" : undefined);
      return <ProgressBar testId="upload-progress" label={label} detail={detail} value={p && total ? p.done / total : null} />;
    }
    return null;
  })();

  return (
    <form onSubmit={upload} className="flex flex-col gap-5" aria-describedby="upload-help">
      <p id="upload-help" className="text-sm text-slate-700">
        A CSV file with a header row: one row per period (week, month…), one column per spend channel, any controls, and the outcome.
        Comma, semicolon or tab separated; UTF-8 (a byte order mark is fine). Up to {formatBytes(maxBytes)}. You choose what each column is
        after the upload.
      </p>
      <div className="flex flex-col gap-1">
        <label htmlFor="dataset-file" className="text-sm font-medium text-slate-800">
          CSV file
        </label>
        <input
          id="dataset-file"
          name="file"
          type="file"
          accept=".csv,.tsv,.txt,text/csv,text/tab-separated-values,text/plain"
          disabled={busy}
          onChange={(e) => choose(e.target.files?.[0] ?? null)}
          className="block w-full max-w-xl cursor-pointer rounded-md border border-slate-300 bg-white text-sm text-slate-800 file:mr-3 file:cursor-pointer file:border-0 file:bg-shallows-pale file:px-3 file:py-2 file:font-medium file:text-river"
        />
        {file ? (
          <p className="text-xs text-slate-600" data-testid="chosen-file">
            {file.name} · {formatBytes(file.size)}
          </p>
        ) : null}
      </div>
      <div className="flex max-w-xl flex-col gap-1">
        <label htmlFor="dataset-name" className="text-sm font-medium text-slate-800">
          Name <span className="font-normal text-slate-600">(optional)</span>
        </label>
        <input
          id="dataset-name"
          value={name}
          onChange={(e) => setName(e.target.value)}
          disabled={busy}
          maxLength={200}
          placeholder={file ? file.name.replace(/\.(csv|tsv|txt)$/i, "") : "e.g. Weekly history 2023–2025"}
          className="rounded-md border border-slate-300 bg-white px-3 py-2 text-base text-slate-900 shadow-sm focus:outline-2 focus:outline-offset-1 focus:outline-shallows"
        />
      </div>

      {phase.kind === "uploading" ? (
        <ProgressBar testId="upload-progress" label="Uploading" detail={formatBytesOf(phase.loaded, phase.total)} value={phase.total > 0 ? phase.loaded / phase.total : null} />
      ) : null}
      {checkingBar}
      {phase.kind === "done" ? (
        <p role="status" className="text-sm font-medium text-reed">
          Stored. {phase.needsRoles ? "Opening the column roles…" : "Opening the spend history…"}
        </p>
      ) : null}
      {phase.kind === "failed" ? <ProblemReport problem={phase.problem} title={phase.title} /> : null}

      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" className={buttonClass("primary")} disabled={!file || busy || (phase.kind === "failed" && phase.title === "This file is too large")}>
          Upload
        </button>
        {phase.kind === "uploading" ? (
          <button type="button" className={buttonClass("secondary")} onClick={() => xhrRef.current?.abort()}>
            Cancel upload
          </button>
        ) : null}
      </div>
    </form>
  );
}
