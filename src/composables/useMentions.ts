import { computed, type Ref } from 'vue';
import type { Member } from '@shared/model/teams';

/** One entry of the @ list: the text inserted after "@" is the member's name. */
export interface MentionOption {
  value: string;
  label: string;
  userId: string;
}

function escapeRegExp(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}

/**
 * The members a comment mentions: each whose "@Name" appears in it (picked from the list or
 * typed), followed by the end, a space or punctuation. Longer names are tried first so that
 * "@Ana Ruiz" does not also count as "@Ana". In the order they appear; each once.
 */
export function mentionsIn(body: string, members: readonly Pick<Member, 'userId' | 'name'>[]): string[] {
  const found: { userId: string; at: number }[] = [];
  let rest = body;
  for (const m of [...members].sort((a, b) => b.name.length - a.name.length)) {
    const re = new RegExp(`@${escapeRegExp(m.name)}(?=$|[\\s.,;:!?)\\]'’”"])`, 'i');
    const hit = re.exec(rest);
    if (!hit) continue;
    found.push({ userId: m.userId, at: hit.index });
    // Blank out the match so a shorter name inside it is not found again.
    rest = rest.slice(0, hit.index) + ' '.repeat(hit[0].length) + rest.slice(hit.index + hit[0].length);
  }
  return [...new Set(found.sort((a, b) => a.at - b.at).map((f) => f.userId))];
}

/** Splits a comment into plain text and @mentions of known members (for highlighting). */
export function mentionParts(body: string, names: readonly string[]): { text: string; mention: boolean }[] {
  const sorted = [...names].filter(Boolean).sort((a, b) => b.length - a.length);
  if (sorted.length === 0) return [{ text: body, mention: false }];
  const re = new RegExp(`@(?:${sorted.map(escapeRegExp).join('|')})(?=$|[\\s.,;:!?)\\]'’”"])`, 'gi');
  const parts: { text: string; mention: boolean }[] = [];
  let last = 0;
  for (const m of body.matchAll(re)) {
    if (m.index > last) parts.push({ text: body.slice(last, m.index), mention: false });
    parts.push({ text: m[0], mention: true });
    last = m.index + m[0].length;
  }
  if (last < body.length) parts.push({ text: body.slice(last), mention: false });
  return parts;
}

/** Options for ant-design-vue's Mentions from the team's members, and what a text mentions. */
export function useMentions(members: Ref<readonly Member[] | null>) {
  const options = computed<MentionOption[]>(() => (members.value ?? []).map((m) => ({ value: m.name, label: `${m.name} · ${m.role}`, userId: m.userId })));
  return { options, mentionsIn: (body: string) => mentionsIn(body, members.value ?? []) };
}
