"use client";

import { useRouter } from "next/navigation";
import { useId, useMemo, useRef, useState, useTransition } from "react";
import type { CommentDto } from "@/server/comments/store";
import { findMentions, mentionHandle, type Mentionable } from "@/server/comments/mentions";
import { buttonClass, textLinkClass } from "@/ui/button-class";
import { problemText, reviewApi } from "./api";
import { dateText } from "./format";

type Node = CommentDto & { replies: Node[] };

function threadOf(comments: readonly CommentDto[]): Node[] {
  const nodes = new Map<string, Node>(comments.map((comment) => [comment.id, { ...comment, replies: [] }]));
  const roots: Node[] = [];
  for (const node of nodes.values()) {
    const parent = node.parentId ? nodes.get(node.parentId) : undefined;
    if (parent) parent.replies.push(node);
    else roots.push(node);
  }
  return roots;
}

/** Shows the words of a comment with its @mentions set off. */
function Body({ text, mentions }: { text: string; mentions: CommentDto["mentions"] }) {
  const handles = mentions.flatMap((m) => [m.email, m.name ?? ""]).filter(Boolean);
  if (handles.length === 0) return <p className="whitespace-pre-wrap text-sm text-slate-900">{text}</p>;
  const pattern = new RegExp(`(@(?:${handles.map((h) => h.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")).join("|")}))`, "gi");
  return (
    <p className="whitespace-pre-wrap text-sm text-slate-900">
      {text.split(pattern).map((part, index) =>
        index % 2 === 1 ? (
          <strong key={index} className="font-semibold text-river">
            {part}
          </strong>
        ) : (
          part
        ),
      )}
    </p>
  );
}

type FormProps = {
  scenarioId: string;
  version: number;
  comparisonId: string | null;
  parentId?: string | null;
  members: Mentionable[];
  currentUserId: string;
  label: string;
  submitLabel: string;
  onDone?: () => void;
  autoFocus?: boolean;
};

/** The comment box: a mention picker inserts "@Name"; below it, who will be e-mailed. */
export function CommentForm({ scenarioId, version, comparisonId, parentId = null, members, currentUserId, label, submitLabel, onDone, autoFocus }: FormProps) {
  const router = useRouter();
  const id = useId();
  const box = useRef<HTMLTextAreaElement>(null);
  const [text, setText] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  const [pending, startTransition] = useTransition();
  const others = useMemo(() => members.filter((member) => member.userId !== currentUserId), [members, currentUserId]);
  const mentioned = useMemo(() => findMentions(text, others), [text, others]);

  const insertMention = (userId: string) => {
    const member = others.find((candidate) => candidate.userId === userId);
    if (!member) return;
    const handle = `${mentionHandle(member)} `;
    setText((current) => (current === "" || /\s$/.test(current) ? current + handle : `${current} ${handle}`));
    box.current?.focus();
  };

  const submit = () => {
    setProblem(null);
    startTransition(async () => {
      try {
        await reviewApi.comment(scenarioId, version, { body: text, parentId, comparisonId });
        setText("");
        onDone?.();
        router.refresh();
      } catch (error) {
        setProblem(problemText(error));
      }
    });
  };

  return (
    <form
      className="space-y-2 print:hidden"
      onSubmit={(event) => {
        event.preventDefault();
        submit();
      }}
    >
      <label htmlFor={`${id}-text`} className="block text-sm font-medium text-slate-700">
        {label}
      </label>
      <textarea
        id={`${id}-text`}
        ref={box}
        value={text}
        onChange={(event) => setText(event.currentTarget.value)}
        rows={3}
        maxLength={4000}
        autoFocus={autoFocus}
        placeholder="Write a comment. Mention someone with @ and their name or e-mail."
        className="w-full rounded border border-slate-300 px-2 py-1.5 text-sm outline-none focus-visible:ring-2 focus-visible:ring-shallows"
      />
      <div className="flex flex-wrap items-center gap-3">
        {others.length > 0 ? (
          <label className="flex items-center gap-2 text-sm text-slate-700">
            <span>Mention</span>
            <select
              value=""
              onChange={(event) => insertMention(event.currentTarget.value)}
              className="rounded border border-slate-300 bg-white px-2 py-1 text-sm"
              aria-label="Mention a member"
            >
              <option value="">a member…</option>
              {others.map((member) => (
                <option key={member.userId} value={member.userId}>
                  {member.name ?? member.email}
                </option>
              ))}
            </select>
          </label>
        ) : null}
        <button type="submit" disabled={pending || text.trim() === ""} className={buttonClass("primary", "py-1.5")}>
          {pending ? "Posting…" : submitLabel}
        </button>
        {onDone ? (
          <button type="button" onClick={onDone} className={buttonClass("quiet", "px-0")}>
            Cancel
          </button>
        ) : null}
      </div>
      {mentioned.length > 0 ? (
        <p className="text-xs text-slate-600" data-testid="mention-preview">
          Will e-mail {mentioned.map((member) => member.name ?? member.email).join(", ")}.
        </p>
      ) : null}
      <div aria-live="polite">{problem ? <p className="rounded-md border-l-4 border-ember bg-ember/10 px-3 py-2 text-sm" role="alert">{problem}</p> : null}</div>
    </form>
  );
}

function CommentItem({ node, depth, props }: { node: Node; depth: number; props: Omit<FormProps, "label" | "submitLabel" | "parentId" | "onDone"> & { canComment: boolean; locale: string } }) {
  const [replying, setReplying] = useState(false);
  return (
    <li data-testid="comment" className={depth > 0 ? "border-l-2 border-shallows-pale pl-4" : ""}>
      <div className="space-y-1 py-2">
        <p className="text-xs text-slate-600">
          <strong className="font-semibold text-slate-800">{node.authorName ?? "Someone"}</strong> · {dateText(node.createdAt, props.locale)}
          {node.mentions.length > 0 ? ` · e-mailed ${node.mentions.map((m) => m.name ?? m.email).join(", ")}` : ""}
        </p>
        <Body text={node.body} mentions={node.mentions} />
        {props.canComment && !replying ? (
          <button type="button" onClick={() => setReplying(true)} className={`text-xs font-medium ${textLinkClass} print:hidden`}>
            Reply
          </button>
        ) : null}
        {replying ? (
          <div className="pt-1">
            <CommentForm {...props} parentId={node.id} label={`Reply to ${node.authorName ?? "this comment"}`} submitLabel="Post reply" onDone={() => setReplying(false)} autoFocus />
          </div>
        ) : null}
      </div>
      {node.replies.length > 0 ? (
        <ul className={depth < 4 ? "ml-2" : ""}>
          {node.replies.map((reply) => (
            <CommentItem key={reply.id} node={reply} depth={depth + 1} props={props} />
          ))}
        </ul>
      ) : null}
    </li>
  );
}

export type CommentThreadProps = {
  comments: readonly CommentDto[];
  scenarioId: string;
  version: number;
  comparisonId: string | null;
  canComment: boolean;
  members: Mentionable[];
  currentUserId: string;
  locale: string;
};

/** The comments on one version, threaded, with the box to add one. */
export function CommentThread(props: CommentThreadProps) {
  const roots = useMemo(() => threadOf(props.comments), [props.comments]);
  const { comments: _comments, ...rest } = props;
  return (
    <div className="space-y-3" data-testid="comment-thread">
      {roots.length === 0 ? (
        <p className="text-sm text-slate-600">No comments on version {props.version} yet.</p>
      ) : (
        <ul className="divide-y divide-slate-100">
          {roots.map((node) => (
            <CommentItem key={node.id} node={node} depth={0} props={rest} />
          ))}
        </ul>
      )}
      {props.canComment ? (
        <CommentForm {...rest} label={`Comment on version ${props.version}`} submitLabel="Post comment" />
      ) : (
        <p className="text-sm text-slate-600 print:hidden">Your roles let you read the comments; planners and finance write them.</p>
      )}
    </div>
  );
}
