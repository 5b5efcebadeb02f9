/**
 * `@` mentions in a comment: a member is mentioned by `@` + their e-mail address, `@` + their full
 * name, or `@` + their first name when no other member shares it. Case does not matter; the
 * mention must end at a word boundary ("@Felix Brandt," mentions Felix Brandt; "@Felixa" nobody).
 * Pure (no I/O), so the comment form can show who will be notified with the same rules.
 */
export type Mentionable = { userId: string; name: string | null; email: string };

const escapeRegExp = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

function mentioned(body: string, handle: string): boolean {
  if (handle.trim() === "") return false;
  const pattern = new RegExp(`(^|[^\\p{L}\\p{N}_.@])@${escapeRegExp(handle)}(?![\\p{L}\\p{N}_@]|\\.[\\p{L}\\p{N}])`, "iu");
  return pattern.test(body);
}

const firstName = (name: string | null) => (name ?? "").trim().split(/\s+/)[0] ?? "";

/** The members a comment mentions, in the members' order, without duplicates. */
export function findMentions(body: string, members: readonly Mentionable[]): Mentionable[] {
  if (!body.includes("@")) return [];
  const firstNameCount = new Map<string, number>();
  for (const member of members) {
    const first = firstName(member.name).toLowerCase();
    if (first) firstNameCount.set(first, (firstNameCount.get(first) ?? 0) + 1);
  }
  return members.filter((member) => {
    if (mentioned(body, member.email)) return true;
    if (member.name && mentioned(body, member.name.trim())) return true;
    const first = firstName(member.name);
    return first !== "" && firstNameCount.get(first.toLowerCase()) === 1 && mentioned(body, first);
  });
}

/** How the comment form writes a mention of a member: "@Felix Brandt". */
export const mentionHandle = (member: Pick<Mentionable, "name" | "email">) => `@${member.name?.trim() || member.email}`;
